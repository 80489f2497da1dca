import type { DataSource } from 'typeorm';
import type { MailOutbox } from './mail/outbox';
import type { AppLinks } from './mail/links';
import type { PhotoStore } from './storage/photo-store';
import type { FileStore } from './storage/file-store';
import type { PdfRenderer } from './pdf/pdf-renderer';
import type { PaymentsPort } from './payments';
import type { AfterAnswer } from './http/after-answer';

/**
 * What the business modules need from the outside world, built once by createApp from AppDeps. Every hosted
 * service is a port injected here (server/index.ts wires the real adapters, tests their own): nothing in a
 * module reads the clock, the mail server, the file system or a payments API any other way.
 */
export interface ServiceContext {
  ds: DataSource;
  /** Mail is written to the outbox inside the use case's transaction (queueMail); kick() after commit. */
  outbox: MailOutbox;
  /** Links into the app for mail and documents (from PUBLIC_URL). */
  links: AppLinks;
  /** Epoch ms. Injected so tests and the demo seed can fix "today" (a block's days are in its own zone). */
  now: () => number;
  log: (msg: string) => void;
  photos: PhotoStore;
  /** Generated files (PDF records) by key, under DATA_DIR/documents; see modules/documents. */
  documents: FileStore;
  /** Renders the grazing-log and invoice PDFs; call it outside write transactions. */
  pdf: PdfRenderer;
  /** The payments API (server/lib/payments): the SDK adapter on the local fake or the hosted API; never inside a write transaction. */
  payments: PaymentsPort;
  /** Work a route runs after it has answered (awaited at shutdown and by tests). */
  afterAnswer: AfterAnswer;
  /** Signs the short-lived photo access tokens (the sign-in secret; tokens carry their own `typ`). */
  tokenSecret: string;
}

import type { DataSource } from 'typeorm';
import type { MailPort } from './mail/mail-port';
import type { PhotoStore } from './storage/photo-store';
import type { FileStore } from './storage/file-store';
import type { PdfRenderer } from './pdf/pdf-renderer';

/** What the marketplace services need from the outside world; routes build it once from AppDeps. */
export interface ServiceContext {
  ds: DataSource;
  mail: MailPort;
  /** Epoch ms. Injected so tests and the demo seed can fix "today" (a block's days are in its own zone). */
  now: () => number;
  log: (msg: string) => void;
  photos: PhotoStore;
  /** Generated files (PDF records) by key, under DATA_DIR/documents; see modules/documents. */
  documents: FileStore;
  /** Renders the grazing-log and invoice PDFs; call it outside write transactions. */
  pdf: PdfRenderer;
  /** Signs the short-lived photo access tokens (the sign-in secret; tokens carry their own `typ`). */
  tokenSecret: string;
}

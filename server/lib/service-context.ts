import type { DataSource } from 'typeorm';
import type { MailPort } from './mail/mail-port';
import type { PhotoStore } from './storage/photo-store';

/** What the marketplace services need from the outside world; routes build it once from AppDeps. */
export interface ServiceContext {
  ds: DataSource;
  mail: MailPort;
  /** Epoch ms. Injected so tests and the demo seed can fix "today" (a block's days are in its own zone). */
  now: () => number;
  log: (msg: string) => void;
  photos: PhotoStore;
  /** Signs the short-lived photo access tokens (the sign-in secret; tokens carry their own `typ`). */
  tokenSecret: string;
}

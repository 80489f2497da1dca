import type { ServiceContext } from '../../lib/service-context';
import type { PaymentsPort } from '../../lib/payments';

/** What invoicing needs beyond the shared ServiceContext: the payments API and a folder for the invoice PDFs. */
export interface InvoicesContext extends ServiceContext {
  payments: PaymentsPort;
  /** DATA_DIR/documents in production; invoice PDFs go under invoices/ in it. */
  documentsDir: string;
}

/** The part of it the background work (creating invoices in the payments API, applying events) uses. */
export type InvoiceWorkContext = Pick<InvoicesContext, 'ds' | 'payments' | 'outbox' | 'links' | 'now' | 'log' | 'documentsDir' | 'tokenSecret'>;

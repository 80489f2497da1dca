import type { GrazingLogPdfData, InvoicePdfData } from './types';

export type * from './types';
export { invoiceLinesFromCharge } from './invoice-lines';

/**
 * Makes Fieldfold's PDF records from plain data. The same data always gives the same bytes (the file's
 * dates come from the data, nothing is random), so a stored file's SHA-256 can be checked by rendering
 * again. Rendering is a side effect: never call it inside a write transaction.
 */
export interface PdfRenderer {
  renderGrazingLog(data: GrazingLogPdfData): Promise<Buffer>;
  renderInvoice(data: InvoicePdfData): Promise<Buffer>;
}

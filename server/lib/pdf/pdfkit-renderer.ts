import type { PdfRenderer } from './pdf-renderer';
import { renderGrazingLog } from './grazing-log';
import { renderInvoice } from './invoice';

/** The PDF port's adapter: pdfkit with Fieldfold's own fonts from assets/fonts. */
export function pdfkitRenderer(): PdfRenderer {
  return { renderGrazingLog, renderInvoice };
}

import jwt from 'jsonwebtoken';
import { tokenKey } from '../../lib/http/token-key';

// A download link cannot send an Authorization header, so each invoice view carries a PDF link with its own
// short-lived signed token: which invoice, for which viewer, for one hour. The route still re-checks that the
// viewer is a party. Typed ('invoice-pdf'), and without a session id, so it never passes as a sign-in token.

export const INVOICE_PDF_ACCESS_TTL_S = 3600;

export function signInvoicePdfAccess(secret: string, invoiceId: string, viewerId: string): string {
  return jwt.sign({ typ: 'invoice-pdf', iid: invoiceId }, tokenKey(secret), { subject: viewerId, algorithm: 'HS256', expiresIn: INVOICE_PDF_ACCESS_TTL_S });
}

/** The viewer id the token was issued to, if it is a valid, unexpired token for exactly this invoice. */
export function verifyInvoicePdfAccess(secret: string, token: string, invoiceId: string): string | null {
  try {
    const claims = jwt.verify(token, tokenKey(secret), { algorithms: ['HS256'] }) as { typ?: string; iid?: string; sub?: string };
    if (claims.typ !== 'invoice-pdf' || claims.iid !== invoiceId || typeof claims.sub !== 'string') return null;
    return claims.sub;
  } catch {
    return null;
  }
}

export function invoicePdfUrl(invoiceId: string, token: string): string {
  return `/api/invoices/${encodeURIComponent(invoiceId)}/pdf?access=${encodeURIComponent(token)}`;
}

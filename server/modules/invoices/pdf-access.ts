import jwt from 'jsonwebtoken';
import type { LinkViewer } from '../../lib/http/auth';
import { tokenKey } from '../../lib/http/token-key';

// A download link cannot send an Authorization header, so each invoice view carries a PDF link with its own
// short-lived signed token: which invoice, for which viewer and which of the viewer's sign-in sessions, for one
// hour. It opens only while that session is open, and the route still re-checks that the viewer is a party.
// Typed ('invoice-pdf'), so it never passes as a sign-in token.

export const INVOICE_PDF_ACCESS_TTL_S = 3600;

export function signInvoicePdfAccess(secret: string, invoiceId: string, viewer: LinkViewer): string {
  return jwt.sign({ typ: 'invoice-pdf', iid: invoiceId, ...(viewer.sessionId ? { ses: viewer.sessionId } : {}) }, tokenKey(secret), {
    subject: viewer.id,
    algorithm: 'HS256',
    expiresIn: INVOICE_PDF_ACCESS_TTL_S,
  });
}

/** The viewer and session the token was issued to, if it is a valid, unexpired token for exactly this invoice. */
export function verifyInvoicePdfAccess(secret: string, token: string, invoiceId: string): { viewerId: string; sessionId: string } | null {
  try {
    const claims = jwt.verify(token, tokenKey(secret), { algorithms: ['HS256'] }) as { typ?: string; iid?: string; sub?: string; ses?: string };
    if (claims.typ !== 'invoice-pdf' || claims.iid !== invoiceId || typeof claims.sub !== 'string' || typeof claims.ses !== 'string') return null;
    return { viewerId: claims.sub, sessionId: claims.ses };
  } catch {
    return null;
  }
}

export function invoicePdfUrl(invoiceId: string, token: string): string {
  return `/api/invoices/${encodeURIComponent(invoiceId)}/pdf?access=${encodeURIComponent(token)}`;
}

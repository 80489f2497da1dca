import { AppError } from '../../lib/errors/app-error';

// Keyset cursors for the contract list and the log: the sort key of the last row of a page, as opaque
// base64url text. A cursor this API did not make is a 400 naming `cursor`, never a 500.

export function encodeCursor(parts: unknown[]): string {
  return Buffer.from(JSON.stringify(parts), 'utf8').toString('base64url');
}

export function decodeCursor<T extends unknown[]>(cursor: string, shape: (parts: unknown[]) => parts is T): T {
  try {
    const parts: unknown = JSON.parse(Buffer.from(cursor, 'base64url').toString('utf8'));
    if (Array.isArray(parts) && shape(parts)) return parts;
  } catch {
    // not JSON: the 400 below
  }
  throw AppError.badRequest('Some fields need attention', { cursor: 'Cursor is not one this API gave' });
}

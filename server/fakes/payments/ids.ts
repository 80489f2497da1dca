import crypto from 'node:crypto';

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';

/** An object id in the API's style: a type prefix and 24 random base-62 characters ("in_1Qx…"). */
export function newId(prefix: string, length = 24): string {
  const bytes = crypto.randomBytes(length);
  let out = '';
  // 248 = 4 × 62: bytes at or above it are dropped so every character is equally likely.
  for (const b of bytes) if (b < 248) out += ALPHABET[b % 62];
  while (out.length < length) out += ALPHABET[crypto.randomInt(62)];
  return `${prefix}_${out}`;
}

/** Eight capital letters or digits, like a customer's invoice_prefix. */
export function invoicePrefix(): string {
  const chars = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789';
  let out = '';
  for (let i = 0; i < 8; i++) out += chars[crypto.randomInt(chars.length)];
  return out;
}

import { createSecretKey, type KeyObject } from 'node:crypto';

// jsonwebtoken turns a secret given as a string into a key on every sign and verify, and it tries it as a PEM
// public or private key first: a parse that throws, then the fallback to an HMAC key. That failed parse cost
// more than the rest of a signed-in request. The same bytes as a KeyObject, made once per secret, sign and
// verify exactly the same tokens.

const keys = new Map<string, KeyObject>();

/** The HMAC (HS256) key of a token secret, for jwt.sign and jwt.verify. */
export function tokenKey(secret: string): KeyObject {
  let key = keys.get(secret);
  if (!key) {
    key = createSecretKey(Buffer.from(secret, 'utf8'));
    keys.set(secret, key);
  }
  return key;
}

import jwt from 'jsonwebtoken';
import { tokenKey } from '../../lib/http/token-key';

// A web <img> cannot send an Authorization header, so each photo URL in a block view carries its own
// short-lived signed token: which photo, of which block, for which viewer, for one hour. The photo route
// still re-checks that this viewer may see the block, so a token outlives a permission by no more than
// the request that checks it. Tokens are typed ('photo') so a sign-in token can never pass as one, nor one
// of these as a sign-in token (sign-in tokens carry a session id; requireAuth rejects tokens without one).

export const PHOTO_ACCESS_TTL_S = 3600;

interface PhotoAccessClaims {
  typ: 'photo';
  pid: string;
  bid: string;
  sub: string;
}

export function signPhotoAccess(secret: string, p: { photoId: string; blockId: string; viewerId: string }): string {
  return jwt.sign({ typ: 'photo', pid: p.photoId, bid: p.blockId }, tokenKey(secret), {
    subject: p.viewerId,
    algorithm: 'HS256',
    expiresIn: PHOTO_ACCESS_TTL_S,
  });
}

/** The viewer id the token was issued to, if it is a valid, unexpired token for exactly this photo. */
export function verifyPhotoAccess(secret: string, token: string, p: { photoId: string; blockId: string }): string | null {
  try {
    const claims = jwt.verify(token, tokenKey(secret), { algorithms: ['HS256'] }) as Partial<PhotoAccessClaims>;
    if (claims.typ !== 'photo' || claims.pid !== p.photoId || claims.bid !== p.blockId || typeof claims.sub !== 'string') return null;
    return claims.sub;
  } catch {
    return null;
  }
}

/** Path of a photo under the API origin, ready for an <img src>. */
export function photoUrl(blockId: string, photoId: string, token: string): string {
  return `/api/blocks/${encodeURIComponent(blockId)}/photos/${encodeURIComponent(photoId)}?access=${encodeURIComponent(token)}`;
}

import type { RequestHandler } from 'express';
import jwt from 'jsonwebtoken';
import { bearerOrAccessLink, type LinkViewer } from '../../lib/http/auth';
import { param } from '../../lib/http/params';
import { tokenKey } from '../../lib/http/token-key';
import type { ServiceContext } from '../../lib/service-context';

// A web <img> cannot send an Authorization header, so each photo URL in a block view carries its own
// short-lived signed token: which photo, of which block, for which viewer and which of the viewer's sign-in
// sessions, for one hour. The photo route opens it only while that session is open (signing out ends it) and
// still re-checks that this viewer may see the block, so a token outlives a permission by no more than the
// request that checks it. Tokens are typed ('photo') so a sign-in token can never pass as one, nor one of
// these as a sign-in token (requireAuth refuses any token with a `typ`).

export const PHOTO_ACCESS_TTL_S = 3600;

interface PhotoAccessClaims {
  typ: 'photo';
  pid: string;
  bid: string;
  /** The viewer's sign-in session the link was made under. */
  ses: string;
  sub: string;
}

export function signPhotoAccess(secret: string, p: { photoId: string; blockId: string; viewer: LinkViewer }): string {
  return jwt.sign({ typ: 'photo', pid: p.photoId, bid: p.blockId, ...(p.viewer.sessionId ? { ses: p.viewer.sessionId } : {}) }, tokenKey(secret), {
    subject: p.viewer.id,
    algorithm: 'HS256',
    expiresIn: PHOTO_ACCESS_TTL_S,
  });
}

/** The viewer and session the token was issued to, if it is a valid, unexpired token for exactly this photo. */
export function verifyPhotoAccess(secret: string, token: string, p: { photoId: string; blockId: string }): { viewerId: string; sessionId: string } | null {
  try {
    const claims = jwt.verify(token, tokenKey(secret), { algorithms: ['HS256'] }) as Partial<PhotoAccessClaims>;
    if (claims.typ !== 'photo' || claims.pid !== p.photoId || claims.bid !== p.blockId || typeof claims.sub !== 'string' || typeof claims.ses !== 'string') return null;
    return { viewerId: claims.sub, sessionId: claims.ses };
  } catch {
    return null;
  }
}

/** Path of a photo under the API origin, ready for an <img src>. */
export function photoUrl(blockId: string, photoId: string, token: string): string {
  return `/api/blocks/${encodeURIComponent(blockId)}/photos/${encodeURIComponent(photoId)}?access=${encodeURIComponent(token)}`;
}

/**
 * For a photo route (`…/:id/…/photos/:photoId`, `:id` the block or the contract whose log holds it): the bearer
 * token as usual, or the signed `access` link an <img> carries; `reload` names what to reload for a fresh link.
 */
export function photoViewer(ctx: ServiceContext, auth: RequestHandler, reload: 'block' | 'log'): RequestHandler {
  return bearerOrAccessLink({
    ds: ctx.ds,
    now: ctx.now,
    auth,
    verify: (access, req) => verifyPhotoAccess(ctx.tokenSecret, access, { photoId: param(req, 'photoId'), blockId: param(req, 'id') }),
    invalidMessage: `This photo link has expired or is not valid; reload the ${reload}`,
  });
}

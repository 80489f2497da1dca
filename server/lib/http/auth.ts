import type { Request, RequestHandler } from 'express';
import jwt from 'jsonwebtoken';
import type { DataSource } from 'typeorm';
import { AppError } from '../errors/app-error';
import { Account, Session } from '../../modules/accounts/account.entity';
import { PreparedSelect } from '../db/prepared-select';
import { tokenKey } from './token-key';
import type { Role } from '../../../lib/roles';

export interface TokenClaims {
  sub: string;
  sid: string;
  /** Set only on signed links (photo, invoice PDF): such a token is never a sign-in. */
  typ?: string;
}

/** Whom a signed link is for: the account, and the sign-in session it was issued under (none: the link never opens). */
export interface LinkViewer {
  id: string;
  sessionId?: string | null;
}

/** True while the session is open: not signed out, not rotated away, not expired. */
export async function sessionIsOpen(ds: DataSource, accountId: string, sessionId: string, now: () => number): Promise<boolean> {
  const session = await ds.getRepository(Session).findOneBy({ id: sessionId, accountId });
  return !!session && session.expiresAt.getTime() >= now();
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      account?: Account;
      sessionId?: string;
    }
  }
}

export function accountRoles(account: Account): Role[] {
  return account.roles.split(',').filter(Boolean) as Role[];
}

export function hasRole(account: Account, role: Role): boolean {
  return accountRoles(account).includes(role);
}

/** The signed-in account of a session that is still open, in one query: the session's id, account and expiry. */
const sessionAccount = new PreparedSelect((em) =>
  em
    .createQueryBuilder(Account, 'a')
    .innerJoin(Session, 's', 's.account_id = a.id')
    .where('s.id = :sid AND s.account_id = :sub AND s.expires_at >= :now'),
);

/** 401 unless the bearer token is valid, unexpired and its session still open. */
export function requireAuth(ds: DataSource, secret: string, now: () => number = Date.now): RequestHandler {
  const key = tokenKey(secret);
  return async (req, _res, next) => {
    try {
      const header = req.get('authorization') ?? '';
      const match = /^Bearer\s+(\S+)$/i.exec(header);
      if (!match) throw AppError.unauthenticated();
      let claims: TokenClaims;
      try {
        claims = jwt.verify(match[1], key, { algorithms: ['HS256'], clockTimestamp: Math.floor(now() / 1000) }) as TokenClaims;
      } catch {
        throw AppError.unauthenticated('Your sign-in has expired or is not valid. Sign in again.');
      }
      // Other tokens signed with the same secret (photo and PDF links) carry a `typ` and no `sid`: never a sign-in.
      if (claims.typ !== undefined || typeof claims.sid !== 'string' || typeof claims.sub !== 'string') {
        throw AppError.unauthenticated('Your sign-in is not valid. Sign in again.');
      }
      const account = await sessionAccount.one(ds.manager, { sid: claims.sid, sub: claims.sub, now: new Date(now()) });
      if (!account) throw AppError.unauthenticated('You have been signed out. Sign in again.');
      account.sessionId = claims.sid;
      req.account = account;
      req.sessionId = claims.sid;
      next();
    } catch (err) {
      next(err);
    }
  };
}

/** 403 for a signed-in account that lacks the role (never 401: the caller is known). */
export function requireRole(role: Role): RequestHandler {
  return (req, _res, next) => {
    if (!req.account) return next(AppError.unauthenticated());
    if (!hasRole(req.account, role)) return next(AppError.forbidden(`Only a ${role} account may do this`));
    next();
  };
}

/** The signed-in account, for handlers behind requireAuth. */
export function signedIn(req: Express.Request): Account {
  if (!req.account) throw AppError.unauthenticated();
  return req.account;
}

export interface AccessLinkCheck {
  ds: DataSource;
  now: () => number;
  /** requireAuth, for a request that sends its bearer token instead. */
  auth: RequestHandler;
  /** The link's viewer and session when it is a valid, unexpired link for exactly this record; null otherwise. */
  verify: (access: string, req: Request) => { viewerId: string; sessionId: string } | null;
  invalidMessage: string;
}

/**
 * For links an `<img>` or a download opens, which cannot send a header: the bearer token as usual, or a signed
 * `access` query parameter naming the viewer and the sign-in session it was made for. A link opens only while
 * that session is open, so signing out (or rotating the token) ends every link handed out under it. Either way
 * the viewer's id is left in `res.locals.viewerId` for the route's own policy.
 */
export function bearerOrAccessLink(check: AccessLinkCheck): RequestHandler {
  return async (req, res, next) => {
    const access = req.query.access;
    if (access === undefined) {
      return check.auth(req, res, (err?: unknown) => {
        if (err) return next(err);
        res.locals.viewerId = signedIn(req).id;
        next();
      });
    }
    try {
      if (typeof access !== 'string') throw AppError.badRequest('Give one access token', { access: 'Give one access token' });
      const link = check.verify(access, req);
      if (!link || !(await sessionIsOpen(check.ds, link.viewerId, link.sessionId, check.now))) throw AppError.unauthenticated(check.invalidMessage);
      res.locals.viewerId = link.viewerId;
      next();
    } catch (err) {
      next(err);
    }
  };
}

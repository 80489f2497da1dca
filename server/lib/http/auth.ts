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
      // Other tokens signed with the same secret (photo access links) carry no session: never a sign-in.
      if (typeof claims.sid !== 'string' || typeof claims.sub !== 'string') throw AppError.unauthenticated('Your sign-in is not valid. Sign in again.');
      const account = await sessionAccount.one(ds.manager, { sid: claims.sid, sub: claims.sub, now: new Date(now()) });
      if (!account) throw AppError.unauthenticated('You have been signed out. Sign in again.');
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

/**
 * For links an `<img>` or a download opens, which cannot send a header: the bearer token as usual, or a signed
 * `access` query parameter that `verify` turns into the viewer's account id (null when it is expired, forged or
 * for another record). Either way the viewer's id is left in `res.locals.viewerId` for the route's own policy.
 */
export function bearerOrAccessLink(auth: RequestHandler, verify: (access: string, req: Request) => string | null, invalidMessage: string): RequestHandler {
  return (req, res, next) => {
    const access = req.query.access;
    if (access === undefined) {
      return auth(req, res, (err?: unknown) => {
        if (err) return next(err);
        res.locals.viewerId = signedIn(req).id;
        next();
      });
    }
    if (typeof access !== 'string') return next(AppError.badRequest('Give one access token', { access: 'Give one access token' }));
    const viewerId = verify(access, req);
    if (!viewerId) return next(AppError.unauthenticated(invalidMessage));
    res.locals.viewerId = viewerId;
    next();
  };
}

import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, MemoryStore, rateLimit, type Options, type Store } from 'express-rate-limit';
import jwt from 'jsonwebtoken';
import { AppError } from '../errors/app-error';

// Every request limit of the API, built once per app by express-rate-limit. The principle: limit the guesser,
// not the account. Wrong passwords count per source address and per (email, address), so someone guessing
// from one address is stopped there and never locks the owner out on another; sign-up and password-reset
// requests count per address (and reset per email too); uploads and writes count per signed-in account, or
// per address without a valid token, with limits no person at a keyboard (or a phone flushing its offline
// queue) reaches.
//
// The counters live in this process's memory (express-rate-limit's MemoryStore): one Fieldfold process serves
// today, and a restart forgets them. With several processes behind one proxy each would count alone; issue 12
// may move them into the database. `AppDeps.rateLimits.store` is that seam: a factory giving each limiter its
// own store (express-rate-limit refuses one store shared by two limiters), e.g. one table row per key.

export interface Limit {
  /** Requests counted per key in one window. */
  limit: number;
  windowMs: number;
}

export interface RateLimitSettings {
  /** Failed sign-ins from one address (successes never count). */
  signInPerIp: Limit;
  /** Failed sign-ins for one email from one address; a successful sign-in there clears it. */
  signInPerEmailAndIp: Limit;
  /** Sign-up attempts from one address. */
  signUpPerIp: Limit;
  /** Password-reset requests (and confirmations) from one address. */
  passwordResetPerIp: Limit;
  /** Password-reset mails asked for one email, from anywhere. */
  passwordResetPerEmail: Limit;
  /** Photo uploads (block photos and log photos) per account, or per address when not signed in. */
  uploadsPerCaller: Limit;
  /** POST, PATCH and DELETE under /api (but sign-in, sign-up and the calculator) per account or address. */
  writesPerCaller: Limit;
}

const MINUTE = 60_000;

export const DEFAULT_RATE_LIMITS: RateLimitSettings = {
  signInPerIp: { limit: 30, windowMs: 15 * MINUTE },
  signInPerEmailAndIp: { limit: 10, windowMs: 15 * MINUTE },
  signUpPerIp: { limit: 20, windowMs: 60 * MINUTE },
  passwordResetPerIp: { limit: 20, windowMs: 60 * MINUTE },
  passwordResetPerEmail: { limit: 3, windowMs: 60 * MINUTE },
  uploadsPerCaller: { limit: 120, windowMs: 15 * MINUTE },
  writesPerCaller: { limit: 1000, windowMs: 10 * MINUTE },
};

/** The default limits with every count multiplied by `factor` (RATE_LIMIT_MULTIPLIER); the windows stay. */
export function scaledLimits(factor: number): RateLimitSettings {
  return Object.fromEntries(Object.entries(DEFAULT_RATE_LIMITS).map(([name, l]) => [name, { ...l, limit: l.limit * factor }])) as unknown as RateLimitSettings;
}

export interface RateLimitOptions {
  /** Limits to change (tests make them small, or large enough never to matter). */
  limits?: Partial<RateLimitSettings>;
  /** A store per limiter, by the limiter's name (default: express-rate-limit's MemoryStore, in this process). */
  store?: (name: keyof RateLimitSettings) => Store;
}

export interface ApiRateLimits {
  signIn: RequestHandler[];
  signUp: RequestHandler;
  passwordReset: RequestHandler[];
  uploads: RequestHandler;
  writes: RequestHandler;
}

/** The address a request came from, IPv6 folded to its /56 (one household or host holds a whole prefix). */
function addressKey(req: Request): string {
  return ipKeyGenerator(req.ip ?? req.socket.remoteAddress ?? 'unknown');
}

/** The email a sign-in or reset body names, as accounts store it; '' when there is none to read. */
function bodyEmail(req: Request): string {
  const email = (req.body as { email?: unknown } | undefined)?.email;
  return typeof email === 'string' ? email.trim().toLowerCase().slice(0, 254) : '';
}

function minutes(ms: number): string {
  const m = Math.max(1, Math.ceil(ms / MINUTE));
  return `${m} min`;
}

export function apiRateLimits(tokenSecret: string, options: RateLimitOptions = {}): ApiRateLimits {
  const settings: RateLimitSettings = { ...DEFAULT_RATE_LIMITS, ...options.limits };

  function limiter(name: keyof RateLimitSettings, what: string, extra: Partial<Options>): RequestHandler {
    const { limit, windowMs } = settings[name];
    return rateLimit({
      limit,
      windowMs,
      store: options.store?.(name) ?? new MemoryStore(),
      // RateLimit and RateLimit-Policy on every counted answer; Retry-After (seconds) on the 429.
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      handler: (req, _res, next) => {
        const resetTime = (req as Request & { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime;
        const wait = resetTime ? resetTime.getTime() - Date.now() : windowMs;
        next(new AppError(429, 'too_many_attempts', `Too many ${what}. Try again in ${minutes(wait)}.`));
      },
      ...extra,
    });
  }

  /** The signed-in account a bearer token names (verified, so a forged one can neither dodge nor drain another's count). */
  function callerKey(req: Request): string {
    const match = /^Bearer\s+(\S+)$/i.exec(req.get('authorization') ?? '');
    if (match) {
      try {
        const claims = jwt.verify(match[1], tokenSecret, { algorithms: ['HS256'] }) as { sub?: unknown; sid?: unknown };
        if (typeof claims.sub === 'string' && typeof claims.sid === 'string') return `account:${claims.sub}`;
      } catch {
        // An invalid token counts against the address; requireAuth answers it 401 after.
      }
    }
    return `address:${addressKey(req)}`;
  }

  const signInPerEmailAndIp = limiter('signInPerEmailAndIp', 'sign-in attempts for this account from this address', {
    keyGenerator: (req) => `${bodyEmail(req)}|${addressKey(req)}`,
    skipSuccessfulRequests: true,
  });
  const clearOnSuccess: RequestHandler = (req, res, next) => {
    // The owner who signs in here starts afresh at this address; the count elsewhere is untouched.
    const key = `${bodyEmail(req)}|${addressKey(req)}`;
    res.once('finish', () => {
      if (res.statusCode < 400) void (signInPerEmailAndIp as ReturnType<typeof rateLimit>).resetKey(key);
    });
    next();
  };

  return {
    signIn: [
      limiter('signInPerIp', 'failed sign-ins from this address', { keyGenerator: addressKey, skipSuccessfulRequests: true }),
      signInPerEmailAndIp,
      clearOnSuccess,
    ],
    signUp: limiter('signUpPerIp', 'sign-ups from this address', { keyGenerator: addressKey }),
    passwordReset: [
      limiter('passwordResetPerIp', 'password-reset requests from this address', { keyGenerator: addressKey }),
      limiter('passwordResetPerEmail', 'password-reset mails for this email', {
        keyGenerator: (req) => `email:${bodyEmail(req)}`,
        // Only the request names an email; the confirmation (a token) is counted per address above.
        skip: (req) => bodyEmail(req) === '',
      }),
    ],
    uploads: limiter('uploadsPerCaller', 'photo uploads', { keyGenerator: callerKey }),
    writes: limiter('writesPerCaller', 'changes in a short time', {
      keyGenerator: callerKey,
      skip: (req) => !['POST', 'PATCH', 'PUT', 'DELETE'].includes(req.method) || /^\/(auth|calc)\//.test(req.path),
    }),
  };
}

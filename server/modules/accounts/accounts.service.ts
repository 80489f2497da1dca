import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import jwt from 'jsonwebtoken';
import type { DataSource, EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import { accountRoles } from '../../lib/http/auth';
import { tokenKey } from '../../lib/http/token-key';
import { Account, Session } from './account.entity';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { PASSWORD_MAX_BYTES, PASSWORD_TOO_LONG, utf8Length, type AccountView, type LoginInput, type ProfileInput, type RegisterInput } from '../../../lib/schemas/account';
import type { Role } from '../../../lib/roles';

export interface TokenSettings {
  secret: string;
  ttl: string; // like "7d"
  /** The app's clock in epoch ms (injected; tests fix it). */
  now?: () => number;
}

const BCRYPT_COST = 10;
// Compared against when the email is unknown, so a wrong email costs the same time as a wrong password.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_COST);

export function toAccountView(a: Account): AccountView {
  return {
    id: a.id,
    email: a.email,
    name: a.name,
    roles: accountRoles(a),
    activeRole: (a.activeRole as AccountView['activeRole']) ?? null,
    businessName: a.businessName,
    phone: a.phone,
    homePlace: a.homePlace,
    homeLatitude: a.homeLatitude,
    homeLongitude: a.homeLongitude,
    flock:
      a.flockSpecies && a.flockClass && a.flockHeadCount != null && a.flockBodyWeightLb != null
        ? { species: a.flockSpecies as never, animalClass: a.flockClass as never, headCount: a.flockHeadCount, bodyWeightLb: a.flockBodyWeightLb }
        : null,
    createdAt: a.createdAt.toISOString(),
  };
}

function ttlMs(ttl: string): number {
  const n = Number(ttl.slice(0, -1));
  const unit = ttl.slice(-1);
  return n * { s: 1_000, m: 60_000, h: 3_600_000, d: 86_400_000 }[unit as 's' | 'm' | 'h' | 'd'];
}

/** A new session row and its signed token (the token's `exp` and the row's `expiresAt` are the same instant). */
async function newSession(tx: EntityManager, account: Account, tokens: TokenSettings) {
  const now = (tokens.now ?? Date.now)();
  const session = tx.getRepository(Session).create({ id: crypto.randomUUID(), accountId: account.id, expiresAt: new Date(now + ttlMs(tokens.ttl)) });
  await tx.getRepository(Session).insert(session);
  const token = jwt.sign({ sid: session.id, iat: Math.floor(now / 1000) }, tokenKey(tokens.secret), {
    subject: account.id,
    algorithm: 'HS256',
    expiresIn: Math.floor(ttlMs(tokens.ttl) / 1000),
  });
  return { token, user: toAccountView(account) };
}

async function openSession(ds: DataSource, account: Account, tokens: TokenSettings) {
  return inTransaction(ds, (tx) => newSession(tx, account, tokens));
}

/**
 * Token rotation: the signed-in session is closed and a new one opened, in one transaction. The close is
 * conditional (the row must still be there), so a token refreshes once: a second refresh with it, or a copy
 * of it replayed by someone else, finds no session and gets 401. Links signed under the old session close too.
 */
export async function refreshSession(ds: DataSource, account: Account, sessionId: string, tokens: TokenSettings) {
  return inTransaction(ds, async (tx) => {
    const closed = await tx.getRepository(Session).delete({ id: sessionId, accountId: account.id });
    if (closed.affected !== 1) throw AppError.unauthenticated('You have been signed out. Sign in again.');
    return newSession(tx, account, tokens);
  });
}

/** bcrypt of a new password; one longer than bcrypt reads is refused here too, whatever schema let it through. */
export async function hashPassword(password: string): Promise<string> {
  if (utf8Length(password) > PASSWORD_MAX_BYTES) throw AppError.badRequest(PASSWORD_TOO_LONG, { password: PASSWORD_TOO_LONG });
  return bcrypt.hash(password, BCRYPT_COST);
}

/** Creates an account with the sign-up roles only; `admin` comes from the seed or scripts/make-admin. */
export async function register(ds: DataSource, input: RegisterInput, tokens: TokenSettings, extraRoles: Role[] = []) {
  const email = input.email.toLowerCase();
  const roles = [...new Set([...input.roles, ...extraRoles])];
  const passwordHash = await hashPassword(input.password);
  const taken = () => new AppError(409, 'email_taken', 'An account with this email already exists. Sign in instead.', { email: 'This email already has an account' });
  // Check and insert in one queued transaction: two sign-ups racing for one email give one account and one 409.
  // With several processes both may pass the check; the unique email index refuses the second, also a 409.
  let account: Account;
  try {
    account = await inTransaction(ds, async (tx) => {
      const repo = tx.getRepository(Account);
      if (await repo.existsBy({ email })) throw taken();
      return repo.save(
        repo.create({ id: crypto.randomUUID(), email, passwordHash, name: input.name, roles: roles.join(','), activeRole: input.roles[0] ?? null }),
      );
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw taken();
    throw err;
  }
  return openSession(ds, account, tokens);
}

export async function login(ds: DataSource, input: LoginInput, tokens: TokenSettings) {
  const account = await ds.getRepository(Account).findOneBy({ email: input.email.trim().toLowerCase() });
  const ok = await bcrypt.compare(input.password, account?.passwordHash ?? DUMMY_HASH);
  if (!account || !ok) throw new AppError(401, 'wrong_credentials', 'Email or password is not right');
  return openSession(ds, account, tokens);
}

export async function logout(ds: DataSource, sessionId: string) {
  await inTransaction(ds, (tx) => tx.getRepository(Session).delete({ id: sessionId }));
}

export async function updateProfile(ds: DataSource, account: Account, input: ProfileInput) {
  if (input.activeRole && !accountRoles(account).includes(input.activeRole)) {
    throw AppError.badRequest('Some fields need attention', { activeRole: `This account is not a ${input.activeRole}` });
  }
  if (input.flock && !accountRoles(account).includes('grazier')) {
    throw AppError.badRequest('Some fields need attention', { flock: 'Only a grazier account keeps a flock' });
  }
  const patch: Partial<Account> = {};
  if (input.name !== undefined) patch.name = input.name;
  if (input.businessName !== undefined) patch.businessName = input.businessName || null;
  if (input.phone !== undefined) patch.phone = input.phone || null;
  if (input.homePlace !== undefined) patch.homePlace = input.homePlace || null;
  if (input.homeLatitude !== undefined) patch.homeLatitude = input.homeLatitude;
  if (input.homeLongitude !== undefined) patch.homeLongitude = input.homeLongitude;
  if (input.activeRole !== undefined) patch.activeRole = input.activeRole;
  if (input.flock !== undefined) {
    patch.flockSpecies = input.flock?.species ?? null;
    patch.flockClass = input.flock?.animalClass ?? null;
    patch.flockHeadCount = input.flock?.headCount ?? null;
    patch.flockBodyWeightLb = input.flock?.bodyWeightLb ?? null;
  }
  Object.assign(account, patch);
  await inTransaction(ds, (tx) => tx.getRepository(Account).save(account));
  return toAccountView(account);
}

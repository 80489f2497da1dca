import crypto from 'node:crypto';
import { IsNull } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import { inTransaction } from '../../lib/db/transaction';
import { queueMail } from '../../lib/mail/outbox';
import type { ServiceContext } from '../../lib/service-context';
import { Account, PasswordReset, Session } from './account.entity';
import { hashPassword } from './accounts.service';
import { passwordChangedMail, passwordResetMail } from './accounts.mails';
import { PASSWORD_RESET_TTL_MS, type PasswordResetConfirm, type PasswordResetRequest } from '../../../lib/schemas/account';

// Password reset by mail. The request never says whether an account exists: the route answers 202 before this
// runs, with the same words either way, so neither the answer nor its timing tells. The token is 32 random
// bytes in the link; the database keeps only its SHA-256, so a copy of the database opens no account. A token
// is used once (a conditional UPDATE), within 30 minutes; using it sets the password, signs out every device
// and closes the account's other reset links.

function tokenHash(token: string): string {
  return crypto.createHash('sha256').update(token, 'utf8').digest('hex');
}

/** Queues the reset mail when the email has an account; does nothing (and says nothing) when it has none. */
export async function requestPasswordReset(ctx: ServiceContext, input: PasswordResetRequest): Promise<void> {
  const email = input.email.trim().toLowerCase();
  const account = await ctx.ds.getRepository(Account).findOneBy({ email });
  if (!account) return;
  const token = crypto.randomBytes(32).toString('base64url');
  const now = ctx.now();
  await inTransaction(ctx.ds, async (tx) => {
    await tx.insert(PasswordReset, { id: crypto.randomUUID(), accountId: account.id, tokenHash: tokenHash(token), expiresAt: now + PASSWORD_RESET_TTL_MS, usedAt: null, createdAt: now });
    await queueMail(tx, [passwordResetMail(ctx.links, account, token)], now);
  });
  ctx.outbox.kick();
}

const tokenError = (status: 400 | 410, message: string) => new AppError(status, status === 400 ? 'invalid_token' : 'token_used_or_expired', message, { token: message });

/** Sets the new password with a mailed token: once, before it expires; every session of the account is closed. */
export async function confirmPasswordReset(ctx: ServiceContext, input: PasswordResetConfirm): Promise<void> {
  // bcrypt before the transaction: the write queue is never held for it.
  const passwordHash = await hashPassword(input.password);
  const hash = tokenHash(input.token);
  await inTransaction(ctx.ds, async (tx) => {
    const now = ctx.now();
    const reset = await tx.findOneBy(PasswordReset, { tokenHash: hash });
    if (!reset) throw tokenError(400, 'This reset link is not one we sent: open it from the mail again, or ask for a new one');
    if (reset.usedAt !== null) throw tokenError(410, 'This reset link has been used already: ask for a new one if you need it');
    if (reset.expiresAt <= now) throw tokenError(410, 'This reset link has expired (links work for 30 minutes): ask for a new one');
    // Once only, even for two requests racing with the same link.
    const claimed = await tx.update(PasswordReset, { id: reset.id, usedAt: IsNull() }, { usedAt: now });
    if (claimed.affected !== 1) throw tokenError(410, 'This reset link has been used already: ask for a new one if you need it');
    const account = await tx.findOneByOrFail(Account, { id: reset.accountId });
    await tx.update(Account, { id: account.id }, { passwordHash });
    await tx.delete(Session, { accountId: account.id });
    await tx.update(PasswordReset, { accountId: account.id, usedAt: IsNull() }, { usedAt: now });
    await queueMail(tx, [passwordChangedMail(ctx.links, account)], now);
  });
  ctx.outbox.kick();
}

import { composeMail } from '../../lib/mail/compose';
import type { AppLinks } from '../../lib/mail/links';
import type { MailMessage } from '../../lib/mail/mail-port';
import type { Account } from './account.entity';
import { PASSWORD_RESET_TTL_MS } from '../../../lib/schemas/account';

// What accounts mail: the password-reset link, and the notice that the password was changed.

export function passwordResetMail(links: AppLinks, account: Pick<Account, 'email' | 'name'>, token: string): MailMessage {
  return composeMail({
    to: account.email,
    subject: 'Set a new Fieldfold password',
    greeting: `Hello ${account.name},`,
    paragraphs: [
      `Someone (we hope you) asked to set a new password for the Fieldfold account of ${account.email}.`,
      `The link works once, for ${PASSWORD_RESET_TTL_MS / 60_000} minutes. If you did not ask, ignore this mail: your password stays as it is.`,
    ],
    action: { label: 'Set a new password', url: links.resetPassword(token) },
  });
}

export function passwordChangedMail(links: AppLinks, account: Pick<Account, 'email' | 'name'>): MailMessage {
  return composeMail({
    to: account.email,
    subject: 'Your Fieldfold password was changed',
    greeting: `Hello ${account.name},`,
    paragraphs: [
      'The password of your Fieldfold account was just set anew from a reset link, and every device signed in with the old one was signed out.',
      'If this was not you, ask for a new reset link from the sign-in page at once, and tell us.',
    ],
    action: { label: 'Sign in', url: links.path('/sign-in') },
  });
}

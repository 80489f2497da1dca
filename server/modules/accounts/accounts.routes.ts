import { Router } from 'express';
import type { ServiceContext } from '../../lib/service-context';
import { validateBody } from '../../lib/http/validate';
import { requireAuth, signedIn } from '../../lib/http/auth';
import { loginSchema, passwordResetConfirmSchema, passwordResetRequestSchema, profileSchema, registerSchema } from '../../../lib/schemas/account';
import { confirmPasswordReset, requestPasswordReset } from './password-reset.service';
import { login, logout, refreshSession, register, toAccountView, updateProfile, type TokenSettings } from './accounts.service';

export function accountsRouter(ctx: ServiceContext, tokenSettings: Omit<TokenSettings, 'now'>): Router {
  const router = Router();
  const { ds } = ctx;
  const tokens: TokenSettings = { ...tokenSettings, now: ctx.now };
  const auth = requireAuth(ds, tokens.secret, ctx.now);
  // Sign-in, sign-up and reset requests are rate-limited before they reach here (createApp, rate-limit.ts).

  router.post('/auth/register', validateBody(registerSchema), async (req, res) => {
    res.status(201).json(await register(ds, req.body, tokens));
  });

  router.post('/auth/login', validateBody(loginSchema), async (req, res) => {
    res.json(await login(ds, req.body, tokens));
  });

  // Rotation: the app trades its token for a new one past half its life; the old session (and its links) close.
  router.post('/auth/refresh', auth, async (req, res) => {
    res.json(await refreshSession(ds, signedIn(req), req.sessionId!, tokens));
  });

  router.post('/auth/logout', auth, async (req, res) => {
    await logout(ds, req.sessionId!);
    res.status(204).end();
  });

  // The same 202 and words whether or not the email has an account, sent before any lookup so the time to
  // answer says nothing either; the mail (if any) is queued after.
  router.post('/auth/password-reset', validateBody(passwordResetRequestSchema), (req, res) => {
    res.status(202).json({ message: 'If an account uses this email, a link to set a new password is on its way. It works for 30 minutes.' });
    ctx.afterAnswer.run('password reset request not queued', () => requestPasswordReset(ctx, req.body));
  });

  router.post('/auth/password-reset/confirm', validateBody(passwordResetConfirmSchema), async (req, res) => {
    await confirmPasswordReset(ctx, req.body);
    res.status(204).end();
  });

  router.get('/me', auth, (req, res) => {
    res.json({ user: toAccountView(signedIn(req)) });
  });

  router.patch('/me', auth, validateBody(profileSchema), async (req, res) => {
    res.json({ user: await updateProfile(ds, signedIn(req), req.body) });
  });

  return router;
}

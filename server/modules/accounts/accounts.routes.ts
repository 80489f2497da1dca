import { Router } from 'express';
import type { ServiceContext } from '../../lib/service-context';
import { validateBody } from '../../lib/http/validate';
import { requireAuth, signedIn } from '../../lib/http/auth';
import { AttemptLimiter } from '../../lib/http/rate-limit';
import { loginSchema, profileSchema, registerSchema } from '../../../lib/schemas/account';
import { login, logout, register, toAccountView, updateProfile, type TokenSettings } from './accounts.service';

export function accountsRouter(ctx: ServiceContext, tokenSettings: Omit<TokenSettings, 'now'>): Router {
  const router = Router();
  const { ds } = ctx;
  const tokens: TokenSettings = { ...tokenSettings, now: ctx.now };
  const auth = requireAuth(ds, tokens.secret, ctx.now);
  // 10 failures per address per 15 minutes, and 20 per source IP, before a 429.
  const perEmail = new AttemptLimiter(10, 15 * 60_000, ctx.now);
  const perIp = new AttemptLimiter(20, 15 * 60_000, ctx.now);

  router.post('/auth/register', validateBody(registerSchema), async (req, res) => {
    res.status(201).json(await register(ds, req.body, tokens));
  });

  router.post('/auth/login', validateBody(loginSchema), async (req, res) => {
    const emailKey = String(req.body.email).toLowerCase();
    const ipKey = req.ip ?? 'unknown';
    perEmail.assertAllowed(emailKey);
    perIp.assertAllowed(ipKey);
    try {
      const result = await login(ds, req.body, tokens);
      perEmail.clear(emailKey);
      res.json(result);
    } catch (err) {
      perEmail.fail(emailKey);
      perIp.fail(ipKey);
      throw err;
    }
  });

  router.post('/auth/logout', auth, async (req, res) => {
    await logout(ds, req.sessionId!);
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

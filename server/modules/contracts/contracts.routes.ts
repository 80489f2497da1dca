import { Router } from 'express';
import { requireAuth, signedIn } from '../../lib/http/auth';
import { param } from '../../lib/http/params';
import type { ServiceContext } from '../../lib/service-context';
import { getContract, listContracts } from './contracts.service';

export function contractsRouter(ctx: ServiceContext): Router {
  const router = Router();
  const auth = requireAuth(ctx.ds, ctx.tokenSecret, ctx.now);

  router.get('/contracts', auth, async (req, res) => {
    res.json(await listContracts(ctx, signedIn(req)));
  });

  router.get('/contracts/:id', auth, async (req, res) => {
    res.json({ contract: await getContract(ctx, signedIn(req), param(req, 'id')) });
  });

  return router;
}

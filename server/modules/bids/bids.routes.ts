import { Router } from 'express';
import { requireAuth, requireRole, signedIn } from '../../lib/http/auth';
import { param } from '../../lib/http/params';
import { heavyReads } from '../../lib/http/read-lane';
import type { ServiceContext } from '../../lib/service-context';
import { awardBid, getBid, listBlockBids, listMyBids, placeBid, updateBid, withdrawBid } from './bids.service';

export function bidsRouter(ctx: ServiceContext): Router {
  const router = Router();
  const auth = requireAuth(ctx.ds, ctx.tokenSecret, ctx.now);
  const grazier = requireRole('grazier');
  const grower = requireRole('grower');

  router.post('/blocks/:id/bids', auth, grazier, async (req, res) => {
    res.status(201).json({ bid: await placeBid(ctx, signedIn(req), param(req, 'id'), req.body) });
  });

  router.get('/blocks/:id/bids', auth, async (req, res) => {
    res.json(await heavyReads.run(() => listBlockBids(ctx, signedIn(req), param(req, 'id'), { ...req.query })));
  });

  router.get('/bids', auth, grazier, async (req, res) => {
    res.json(await heavyReads.run(() => listMyBids(ctx, signedIn(req), { ...req.query })));
  });

  router.get('/bids/:id', auth, async (req, res) => {
    res.json({ bid: await getBid(ctx, signedIn(req), param(req, 'id')) });
  });

  router.patch('/bids/:id', auth, grazier, async (req, res) => {
    res.json({ bid: await updateBid(ctx, signedIn(req), param(req, 'id'), req.body) });
  });

  router.post('/bids/:id/withdraw', auth, grazier, async (req, res) => {
    res.json({ bid: await withdrawBid(ctx, signedIn(req), param(req, 'id')) });
  });

  router.post('/bids/:id/award', auth, grower, async (req, res) => {
    res.status(201).json({ contract: await awardBid(ctx, signedIn(req), param(req, 'id')) });
  });

  return router;
}

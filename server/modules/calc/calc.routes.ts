import { Router } from 'express';
import { validateBody } from '../../lib/http/validate';
import { capacityRequestSchema, chargeRequestSchema, forageRequestSchema, headDaysRequestSchema } from '../../../lib/schemas/calc';
import { forageFromSamples } from '../../../lib/grazing/forage';
import { capacity } from '../../../lib/grazing/capacity';
import { headDaysFromMoves } from '../../../lib/grazing/head-days';
import { chargeLines } from '../../../lib/money';

// The public calculator: no sign-in, the same lib functions the blocks, bids and invoices use.
// The schema refuses bad input with 400s naming the field; the lib throws GrazingInputError for what
// only arithmetic can see (mapped to 400 by the error middleware).
export function calcRouter(): Router {
  const router = Router();

  router.post('/forage', validateBody(forageRequestSchema), (req, res) => {
    res.json(forageFromSamples(req.body));
  });

  router.post('/capacity', validateBody(capacityRequestSchema), (req, res) => {
    res.json(capacity(req.body));
  });

  router.post('/head-days', validateBody(headDaysRequestSchema), (req, res) => {
    res.json(headDaysFromMoves(req.body));
  });

  router.post('/charge', validateBody(chargeRequestSchema), (req, res) => {
    res.json(chargeLines(req.body));
  });

  return router;
}

import { Router } from 'express';

// Filled by the grazing-arithmetic work (issue 3): POST /forage, /capacity, /head-days, /charge.
export function calcRouter(): Router {
  return Router();
}

import type { Request } from 'express';
import { AppError } from '../errors/app-error';

/** A named route parameter as one string (Express 5 types wildcard params as string[]). */
export function param(req: Request, name: string): string {
  const value = req.params[name];
  if (typeof value !== 'string' || value === '') throw AppError.notFound();
  return value;
}

import type { Request } from 'express';
import { AppError } from '../errors/app-error';

/**
 * A named route parameter as one string (Express 5 types wildcard params as string[]). One holding a NUL names
 * no record, and is answered so before any query: PostgreSQL refuses a NUL in any text value with an error (a
 * 500), where SQLite would simply find nothing.
 */
export function param(req: Request, name: string): string {
  const value = req.params[name];
  if (typeof value !== 'string' || value === '' || value.includes('\u0000')) throw AppError.notFound();
  return value;
}

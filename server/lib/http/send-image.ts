import type { NextFunction, Response } from 'express';
import { AppError } from '../errors/app-error';

/**
 * Sends a stored photo to someone its module's policy allowed: private caching only, never sniffed or run as a
 * page, and a file gone from the disk is a 404 rather than a 500.
 */
export function sendStoredImage(res: Response, next: NextFunction, file: { path: string; mimeType: string }): void {
  res.set({ 'Cache-Control': 'private, max-age=3600', 'X-Content-Type-Options': 'nosniff', 'Content-Security-Policy': "default-src 'none'" });
  res.type(file.mimeType);
  res.sendFile(file.path, (err?: NodeJS.ErrnoException) => {
    if (!err) return;
    if (err.code === 'ENOENT') return next(AppError.notFound('Photo'));
    if (!res.headersSent) next(err);
  });
}

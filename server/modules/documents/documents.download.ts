import { pipeline } from 'node:stream/promises';
import type { Request, Response } from 'express';
import { AppError } from '../../lib/errors/app-error';
import type { ServiceContext } from '../../lib/service-context';
import { documentFileName, type Document } from './documents.service';

/**
 * Sends a stored document as a download: `Content-Type` from the record (application/pdf),
 * `Content-Disposition: attachment; filename="fieldfold-grazing-log-<short id>-v<version>.pdf"`,
 * `Cache-Control: private, no-store` and an ETag of its SHA-256 (a matching If-None-Match gets 304).
 *
 * It does not decide who may download. The caller's route must first apply its own policy — the contracts
 * module's for a grazing log (the two parties), the invoices module's for an invoice — and answer 404 to
 * anyone else, exactly as for the contract or invoice itself. Only then look the document up and call this.
 */
export async function sendDocument(ctx: ServiceContext, req: Request, res: Response, doc: Document): Promise<void> {
  const etag = `"${doc.sha256}"`;
  const match = req.get('If-None-Match');
  if (match && match.split(',').some((t) => t.trim().replace(/^W\//, '') === etag)) {
    res.set({ ETag: etag, 'Cache-Control': 'private, no-store' }).status(304).end();
    return;
  }
  const file = await ctx.documents.open(doc.storageKey);
  if (!file) {
    // The row outlived its file (a restore from an older backup, a hand-deleted folder): say so in the log.
    ctx.log(`[documents] file missing for document ${doc.id} (${doc.storageKey})`);
    throw AppError.notFound('Document file');
  }
  res.set({
    'Content-Type': doc.contentType,
    'Content-Disposition': `attachment; filename="${documentFileName(doc)}"`,
    'Content-Length': String(file.sizeBytes),
    'Cache-Control': 'private, no-store',
    ETag: etag,
    'X-Content-Type-Options': 'nosniff',
  });
  try {
    await pipeline(file.stream, res);
  } catch (err) {
    // Once bytes are on the wire there is no error body to send; a client that hung up is not an error.
    if (!res.headersSent) throw err;
    res.destroy();
  }
}

import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from '../../lib/errors/app-error';
import { bearerOrAccessLink, requireAuth, requireRole, signedIn } from '../../lib/http/auth';
import { sendStoredImage } from '../../lib/http/send-image';
import { param } from '../../lib/http/params';
import { heavyReads } from '../../lib/http/read-lane';
import type { ServiceContext } from '../../lib/service-context';
import { createBlock, getBlock, listBlocks, publishBlock, updateBlock, withdrawBlock } from './blocks.service';
import { addPhoto, assertCanAddPhoto, deletePhoto, openPhoto } from './block-photos.service';
import { verifyPhotoAccess } from './photo-access';
import { MAX_PHOTO_BYTES } from '../../../lib/schemas/block';

export const PHOTO_FIELD = 'photo';
const MB = MAX_PHOTO_BYTES / (1024 * 1024);

/** multer's own errors carry no HTTP status; give each one the status and field the API promises. */
export function uploadError(err: unknown): AppError {
  if (err instanceof multer.MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE') return new AppError(413, 'too_large', `Each photo may be at most ${MB} MB`, { [PHOTO_FIELD]: `This photo is larger than ${MB} MB` });
    if (err.code === 'LIMIT_UNEXPECTED_FILE') return AppError.badRequest(`Send the photo in the form field "${PHOTO_FIELD}"`, { [err.field || PHOTO_FIELD]: `Send one photo in the form field "${PHOTO_FIELD}"` });
    return AppError.badRequest('Send one photo at a time and nothing else', { [PHOTO_FIELD]: 'Send one photo at a time and nothing else' });
  }
  // Anything else while reading a multipart body is a malformed upload (memory storage touches no disk).
  return AppError.badRequest('The upload could not be read; try again', { [PHOTO_FIELD]: 'The upload could not be read' });
}

export function blocksRouter(ctx: ServiceContext): Router {
  const router = Router();
  const auth = requireAuth(ctx.ds, ctx.tokenSecret, ctx.now);
  const grower = requireRole('grower');
  const parsePhoto = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_PHOTO_BYTES, files: 1, fields: 0, parts: 1 } }).single(PHOTO_FIELD);
  const upload: RequestHandler = (req, res, next) => parsePhoto(req, res, (err?: unknown) => next(err ? uploadError(err) : undefined));

  router.post('/blocks', auth, grower, async (req, res) => {
    res.status(201).json({ block: await createBlock(ctx, signedIn(req), req.body) });
  });

  // The market is the heaviest read: it takes its turn in the read lane so writes never queue behind searches.
  router.get('/blocks', auth, async (req, res) => {
    res.json(await heavyReads.run(() => listBlocks(ctx, signedIn(req), { ...req.query })));
  });

  router.get('/blocks/:id', auth, async (req, res) => {
    res.json({ block: await getBlock(ctx, signedIn(req), param(req, 'id')) });
  });

  router.patch('/blocks/:id', auth, grower, async (req, res) => {
    res.json({ block: await updateBlock(ctx, signedIn(req), param(req, 'id'), req.body) });
  });

  router.post('/blocks/:id/publish', auth, grower, async (req, res) => {
    res.json({ block: await publishBlock(ctx, signedIn(req), param(req, 'id')) });
  });

  router.post('/blocks/:id/withdraw', auth, grower, async (req, res) => {
    res.json({ block: await withdrawBlock(ctx, signedIn(req), param(req, 'id')) });
  });

  // Ownership, state and the photo count are checked before multer reads the body into memory.
  const mayUpload: RequestHandler = async (req, _res, next) => {
    await assertCanAddPhoto(ctx, signedIn(req), param(req, 'id'));
    next();
  };
  router.post('/blocks/:id/photos', auth, grower, mayUpload, upload, async (req, res) => {
    res.status(201).json({ photo: await addPhoto(ctx, signedIn(req), param(req, 'id'), req.file) });
  });

  // An <img> cannot send a bearer token, so the signed `access` link from the block view is accepted too.
  const photoViewer = bearerOrAccessLink({
    ds: ctx.ds,
    now: ctx.now,
    auth,
    verify: (access, req) => verifyPhotoAccess(ctx.tokenSecret, access, { photoId: param(req, 'photoId'), blockId: param(req, 'id') }),
    invalidMessage: 'This photo link has expired or is not valid; reload the block',
  });
  router.get('/blocks/:id/photos/:photoId', photoViewer, async (req, res, next) => {
    const file = await openPhoto(ctx, res.locals.viewerId as string, param(req, 'id'), param(req, 'photoId'));
    sendStoredImage(res, next, file);
  });

  router.delete('/blocks/:id/photos/:photoId', auth, grower, async (req, res) => {
    await deletePhoto(ctx, signedIn(req), param(req, 'id'), param(req, 'photoId'));
    res.status(204).end();
  });

  return router;
}

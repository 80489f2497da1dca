import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { bearerOrAccessLink, requireAuth, signedIn } from '../../lib/http/auth';
import { sendStoredImage } from '../../lib/http/send-image';
import { param } from '../../lib/http/params';
import type { ServiceContext } from '../../lib/service-context';
import { PHOTO_FIELD, uploadError } from '../blocks/blocks.routes';
import { verifyPhotoAccess } from '../blocks/photo-access';
import { cancelContract, getContract, listContracts, signContract } from './contracts.service';
import { closeAmendment, proposeAmendment } from './contract-amendments.service';
import { addLogEntry, addLogPhoto, assertCanAddLogPhoto, listLog, openLogPhoto, voidLogEntry } from './contract-log.service';
import { signOff } from './sign-off.service';
import { grazingLogPdf } from './contract-documents';
import { sendDocument } from '../documents/documents.download';
import { MAX_PHOTO_BYTES } from '../../../lib/schemas/block';

// Thin routes: read the request, call the use case, answer. Who may do what is the services' and the
// policy's business (404 to anyone but the two parties, 403 for the other party's part).

export function contractsRouter(ctx: ServiceContext): Router {
  const router = Router();
  const auth = requireAuth(ctx.ds, ctx.tokenSecret, ctx.now);
  const parsePhoto = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_PHOTO_BYTES, files: 1, fields: 0, parts: 1 } }).single(PHOTO_FIELD);
  const upload: RequestHandler = (req, res, next) => parsePhoto(req, res, (err?: unknown) => next(err ? uploadError(err) : undefined));

  router.get('/contracts', auth, async (req, res) => {
    res.json(await listContracts(ctx, signedIn(req), { ...req.query }));
  });

  router.get('/contracts/:id', auth, async (req, res) => {
    res.json({ contract: await getContract(ctx, signedIn(req), param(req, 'id')) });
  });

  router.post('/contracts/:id/sign', auth, async (req, res) => {
    const origin = { ip: req.ip ?? null, userAgent: req.get('user-agent') ?? null };
    res.json({ contract: await signContract(ctx, signedIn(req), param(req, 'id'), req.body, origin) });
  });

  router.post('/contracts/:id/cancel', auth, async (req, res) => {
    res.json({ contract: await cancelContract(ctx, signedIn(req), param(req, 'id'), req.body) });
  });

  router.post('/contracts/:id/amendments', auth, async (req, res) => {
    res.status(201).json(await proposeAmendment(ctx, signedIn(req), param(req, 'id'), req.body));
  });

  router.post('/contracts/:id/amendments/:amendmentId/withdraw', auth, async (req, res) => {
    res.json({ contract: await closeAmendment(ctx, signedIn(req), param(req, 'id'), param(req, 'amendmentId'), 'withdraw') });
  });

  router.post('/contracts/:id/amendments/:amendmentId/decline', auth, async (req, res) => {
    res.json({ contract: await closeAmendment(ctx, signedIn(req), param(req, 'id'), param(req, 'amendmentId'), 'decline') });
  });

  router.get('/contracts/:id/log', auth, async (req, res) => {
    res.json(await listLog(ctx, signedIn(req), param(req, 'id'), { ...req.query }));
  });

  // 201 for a new entry; 200 with the stored entry when the phone sent this client id before.
  router.post('/contracts/:id/log', auth, async (req, res) => {
    const { entry, created, figures } = await addLogEntry(ctx, signedIn(req), param(req, 'id'), req.body);
    res.status(created ? 201 : 200).json({ entry, figures });
  });

  router.post('/contracts/:id/log/:entryId/void', auth, async (req, res) => {
    res.json(await voidLogEntry(ctx, signedIn(req), param(req, 'id'), param(req, 'entryId'), req.body));
  });

  // Party, authorship, state and the photo count are checked before multer reads the body into memory.
  const mayUpload: RequestHandler = async (req, _res, next) => {
    await assertCanAddLogPhoto(ctx, signedIn(req), param(req, 'id'), param(req, 'entryId'));
    next();
  };
  router.post('/contracts/:id/log/:entryId/photos', auth, mayUpload, upload, async (req, res) => {
    res.status(201).json({ photo: await addLogPhoto(ctx, signedIn(req), param(req, 'id'), param(req, 'entryId'), req.file) });
  });

  // An <img> cannot send a bearer token: the signed `access` link from the log view is accepted too.
  const photoViewer = bearerOrAccessLink({
    ds: ctx.ds,
    now: ctx.now,
    auth,
    verify: (access, req) => verifyPhotoAccess(ctx.tokenSecret, access, { photoId: param(req, 'photoId'), blockId: param(req, 'id') }),
    invalidMessage: 'This photo link has expired or is not valid; reload the log',
  });
  router.get('/contracts/:id/log/:entryId/photos/:photoId', photoViewer, async (req, res, next) => {
    const file = await openLogPhoto(ctx, res.locals.viewerId as string, param(req, 'id'), param(req, 'entryId'), param(req, 'photoId'));
    sendStoredImage(res, next, file);
  });

  router.post('/contracts/:id/sign-off', auth, async (req, res) => {
    res.json({ contract: await signOff(ctx, signedIn(req), param(req, 'id'), req.body) });
  });

  // The stored record through the documents module's download (ETag, 304); a draft of a log still being kept as it is made.
  router.get('/contracts/:id/log.pdf', auth, async (req, res) => {
    const file = await grazingLogPdf(ctx, signedIn(req), param(req, 'id'));
    if ('stored' in file) {
      res.set('X-Document-Version', String(file.stored.version));
      return sendDocument(ctx, req, res, file.stored);
    }
    res.set({
      'Content-Type': 'application/pdf',
      'Content-Disposition': `attachment; filename="${file.fileName}"`,
      'Cache-Control': 'private, no-store',
      'X-Content-Type-Options': 'nosniff',
      'X-Document-Version': '0',
    });
    res.send(file.draft);
  });

  return router;
}

import express, { Router } from 'express';
import { AppError } from '../../lib/errors/app-error';
import { bearerOrAccessLink, requireAuth, requireRole, signedIn } from '../../lib/http/auth';
import { param } from '../../lib/http/params';
import { WebhookEventError, WebhookVerificationError } from '../../lib/payments';
import type { ServiceContext } from '../../lib/service-context';
import { createInvoice, getInvoice, invoicePdf, listInvoices, payInvoice, voidInvoice } from './invoices.service';
import { applyPaymentEvent } from './payment-events';
import { verifyInvoicePdfAccess } from './pdf-access';
import { sendDocument } from '../documents/documents.download';

export function invoicesRouter(ctx: ServiceContext): Router {
  const router = Router();
  const auth = requireAuth(ctx.ds, ctx.tokenSecret, ctx.now);
  const grazier = requireRole('grazier');
  const grower = requireRole('grower');

  router.post('/contracts/:id/invoice', auth, grazier, async (req, res) => {
    const invoice = await createInvoice(ctx, signedIn(req), param(req, 'id'), req.body);
    res.status(201).location(`/api/invoices/${invoice.id}`).json({ invoice });
  });

  router.get('/invoices', auth, async (req, res) => {
    res.json(await listInvoices(ctx, signedIn(req), { ...req.query }));
  });

  router.get('/invoices/:id', auth, async (req, res) => {
    res.json({ invoice: await getInvoice(ctx, signedIn(req), param(req, 'id')) });
  });

  // A download link cannot send a bearer token, so the signed `access` link from the invoice view is accepted too.
  const pdfViewer = bearerOrAccessLink({
    ds: ctx.ds,
    now: ctx.now,
    auth,
    verify: (access, req) => verifyInvoicePdfAccess(ctx.tokenSecret, access, param(req, 'id')),
    invalidMessage: 'This download link has expired or is not valid; reload the invoice',
  });
  router.get('/invoices/:id/pdf', pdfViewer, async (req, res) => {
    // The invoices policy first (404 to anyone but the two parties), then the documents module sends the file.
    const doc = await invoicePdf(ctx, res.locals.viewerId as string, param(req, 'id'));
    await sendDocument(ctx, req, res, doc);
  });

  router.post('/invoices/:id/pay', auth, grower, async (req, res) => {
    res.json({ invoice: await payInvoice(ctx, signedIn(req), param(req, 'id'), req.body) });
  });

  router.post('/invoices/:id/void', auth, grazier, async (req, res) => {
    res.json({ invoice: await voidInvoice(ctx, signedIn(req), param(req, 'id')) });
  });

  return router;
}

/**
 * `POST /api/webhooks/payments`: mount BEFORE express.json, because the signature covers the exact bytes sent
 * (express.raw keeps them; a parsed-and-reserialised body would not verify). Answers 400 for a bad signature or a
 * timestamp outside the tolerance, changing nothing; 200 once the event is stored (applied, or seen before).
 */
export function paymentsWebhookRouter(ctx: ServiceContext): Router {
  const router = Router();
  router.post('/webhooks/payments', express.raw({ type: () => true, limit: '512kb' }), async (req, res) => {
    const raw = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
    let event;
    try {
      event = ctx.payments.verifyWebhook(raw, req.get('stripe-signature') ?? undefined);
    } catch (err) {
      if (err instanceof WebhookEventError) throw new AppError(400, 'bad_event', `The webhook verified but is not an event Fieldfold can read: ${err.message}`);
      if (err instanceof WebhookVerificationError) throw new AppError(400, 'bad_signature', `The webhook signature did not verify: ${err.message}`);
      throw err;
    }
    const outcome = await applyPaymentEvent(ctx, event);
    res.json({ received: true, outcome });
  });
  return router;
}

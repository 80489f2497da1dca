import crypto from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { Response } from 'supertest';
import { changedTables, dbFingerprint } from '../helpers/db-fingerprint';
import { listRoutes } from '../helpers/routes';
import { bidBody, blockBody } from '../helpers/market';
import { ACTORS, LOG_NOW, PASSWORD, trustWorld, type Actor, type TrustWorld } from '../helpers/trust-world';
import { TEST_TOKENS } from '../helpers/test-app';
import { Invoice } from '../../server/modules/invoices/invoice.entity';

// The authorisation matrix: every route of the built app × {signed out, the grower who owns the block, another
// grower, the grazier party to the contract, a rival grazier who also bid, the operator}, and the exact status
// each must get. The table below is the spec (shared/API.md's rules): 401 signed out; 403 for the wrong role or
// for someone who may see the record but not do this; 404 where even existence must not leak (a stranger's
// block, bid, contract or invoice). A route the app has and the table lacks fails the test, and so does a row
// for a route the app no longer has.
//
// Order never matters: a cell whose action changes state gets a record of its own (`request` makes it), so
// each cell sees the same starting point; the shared records (`shared`) are only read, or written in ways that
// leave them as they were for every other cell (an observation added to the log).

jest.setTimeout(120_000);

type Statuses = Record<Actor, number>;
interface Req {
  path: string;
  body?: unknown;
  /** A photo to send as multipart (form field "photo"). */
  photo?: Buffer;
  /** Headers instead of the actor's own sign-in (a fresh session, a signed link). */
  headers?: Record<string, string>;
}
interface Row {
  route: string;
  /** Which record, when a route has several rows. */
  case?: string;
  expect: Statuses;
  /** The clock while the request runs (default TEST_NOW). */
  at?: string;
  /** Builds the request for one cell; makes a fresh record when the action consumes state. */
  request: (actor: Actor) => Promise<Req> | Req;
  /** What a successful answer may show this actor (no rival's bid, no stranger's contract). */
  check?: (res: Response, actor: Actor) => void;
}

/** Statuses by actor, in the column order out · owner · grower · party · rival · admin. */
function s(out: number, owner: number, grower: number, party: number, rival: number, admin: number): Statuses {
  return { out, owner, grower, party, rival, admin };
}
const everyone = (status: number) => s(status, status, status, status, status, status);

let w: TrustWorld;
const shared = {} as {
  open: { blockId: string; photo: { id: string; url: string }; partyBidId: string; rivalBidId: string };
  draft: { blockId: string; photoId: string };
  contract: { contractId: string; blockId: string; entryId: string; photoId: string };
  invoice: { invoiceId: string; contractId: string; pdfUrl: string };
};

beforeAll(async () => {
  w = await trustWorld();
  const openId = await w.openBlock();
  const photo = await w.photo(openId);
  shared.open = { blockId: openId, photo, ...(await w.bids(openId)) };
  const draftId = await w.draftBlock();
  shared.draft = { blockId: draftId, photoId: (await w.photo(draftId)).id };
  const inv = await w.sentInvoice();
  shared.invoice = { invoiceId: inv.invoiceId, contractId: inv.contractId, pdfUrl: inv.pdfUrl };
  const c = await w.grazing();
  const entryId = await w.observation(c.contractId);
  shared.contract = { contractId: c.contractId, blockId: c.blockId, entryId, photoId: (await w.logPhoto(c.contractId, entryId)).id };
  w.resetClock();
});

afterAll(async () => {
  await w?.t.close();
});

let registered = 0;
const ids = (res: Response) => (res.body.items as Array<{ id: string }>).map((i) => i.id);

const CALC = {
  forage: { frameAreaM2: 0.25, samples: [{ dryGrams: 60 }] },
  capacity: { acres: 80, lbDmPerAcre: 2000, utilizationPct: 45, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } },
  headDays: { moves: [{ at: '2027-01-10T08:00:00-08:00', change: 600 }], until: '2027-01-20T08:00:00-08:00' },
  charge: { basis: 'head-day', quantity: 6000, rate: '0.18' },
};

const ROWS: Row[] = [
  // ——— health, accounts ———
  { route: 'GET /api/health', expect: everyone(200), request: () => ({ path: '/api/health' }) },
  {
    route: 'POST /api/auth/register',
    expect: everyone(201),
    request: (actor) => ({ path: '/api/auth/register', body: { email: `new-${actor}-${++registered}@trust.example`, password: PASSWORD, name: 'New Person', roles: ['grower'] } }),
  },
  { route: 'POST /api/auth/login', expect: everyone(200), request: () => ({ path: '/api/auth/login', body: { email: w.person('owner').email, password: PASSWORD } }) },
  {
    route: 'POST /api/auth/logout',
    case: 'a fresh session of the actor',
    expect: s(401, 204, 204, 204, 204, 204),
    request: async (actor) => {
      if (actor === 'out') return { path: '/api/auth/logout' };
      const login = await w.api().post('/api/auth/login').send({ email: w.person(actor).email, password: PASSWORD });
      return { path: '/api/auth/logout', headers: { Authorization: `Bearer ${login.body.token}` } };
    },
  },
  {
    route: 'POST /api/auth/refresh',
    case: 'a fresh session of the actor (refresh closes the one it is sent with)',
    expect: s(401, 200, 200, 200, 200, 200),
    request: async (actor) => {
      if (actor === 'out') return { path: '/api/auth/refresh' };
      const login = await w.api().post('/api/auth/login').send({ email: w.person(actor).email, password: PASSWORD });
      return { path: '/api/auth/refresh', headers: { Authorization: `Bearer ${login.body.token}` } };
    },
  },
  // The same answer for everyone and for any address, so it tells nobody which accounts exist.
  { route: 'POST /api/auth/password-reset', expect: everyone(202), request: () => ({ path: '/api/auth/password-reset', body: { email: w.person('owner').email } }) },
  {
    route: 'POST /api/auth/password-reset/confirm',
    case: 'a token no reset mail carried',
    expect: everyone(400),
    request: () => ({ path: '/api/auth/password-reset/confirm', body: { token: 'f'.repeat(64), password: 'a new long password' } }),
  },
  { route: 'GET /api/me', expect: s(401, 200, 200, 200, 200, 200), request: () => ({ path: '/api/me' }) },
  { route: 'PATCH /api/me', expect: s(401, 200, 200, 200, 200, 200), request: () => ({ path: '/api/me', body: { phone: '+1 530 555 0142' } }) },

  // ——— the public calculator ———
  { route: 'POST /api/calc/forage', expect: everyone(200), request: () => ({ path: '/api/calc/forage', body: CALC.forage }) },
  { route: 'POST /api/calc/capacity', expect: everyone(200), request: () => ({ path: '/api/calc/capacity', body: CALC.capacity }) },
  { route: 'POST /api/calc/head-days', expect: everyone(200), request: () => ({ path: '/api/calc/head-days', body: CALC.headDays }) },
  { route: 'POST /api/calc/charge', expect: everyone(200), request: () => ({ path: '/api/calc/charge', body: CALC.charge }) },

  // ——— blocks ———
  { route: 'POST /api/blocks', expect: s(401, 201, 201, 403, 403, 403), request: async () => ({ path: '/api/blocks', body: blockBody() }) },
  {
    route: 'GET /api/blocks',
    expect: s(401, 200, 200, 200, 200, 403),
    request: () => ({ path: '/api/blocks' }),
    check: (res, actor) => {
      if (actor === 'owner') expect(ids(res)).toEqual(expect.arrayContaining([shared.open.blockId, shared.draft.blockId]));
      if (actor === 'grower') expect(ids(res)).not.toEqual(expect.arrayContaining([shared.open.blockId]));
      if (actor === 'party' || actor === 'rival') expect(ids(res)).not.toContain(shared.draft.blockId);
    },
  },
  { route: 'GET /api/blocks/:id', case: 'open', expect: s(401, 200, 404, 200, 200, 404), request: () => ({ path: `/api/blocks/${shared.open.blockId}` }) },
  { route: 'GET /api/blocks/:id', case: 'draft', expect: s(401, 200, 404, 404, 404, 404), request: () => ({ path: `/api/blocks/${shared.draft.blockId}` }) },
  { route: 'GET /api/blocks/:id', case: 'awarded to the party', expect: s(401, 200, 404, 200, 404, 404), request: () => ({ path: `/api/blocks/${shared.contract.blockId}` }) },
  { route: 'GET /api/blocks/:id', case: 'no such block', expect: s(401, 404, 404, 404, 404, 404), request: () => ({ path: '/api/blocks/00000000-0000-4000-8000-000000000000' }) },
  { route: 'PATCH /api/blocks/:id', case: 'fresh draft', expect: s(401, 200, 404, 403, 403, 403), request: async () => ({ path: `/api/blocks/${await w.draftBlock()}`, body: { notes: 'Gate code is at the shed' } }) },
  { route: 'POST /api/blocks/:id/publish', case: 'fresh draft', expect: s(401, 200, 404, 403, 403, 403), request: async () => ({ path: `/api/blocks/${await w.draftBlock()}/publish` }) },
  { route: 'POST /api/blocks/:id/withdraw', case: 'fresh open block', expect: s(401, 200, 404, 403, 403, 403), request: async () => ({ path: `/api/blocks/${await w.openBlock()}/withdraw` }) },
  { route: 'POST /api/blocks/:id/photos', case: 'fresh draft', expect: s(401, 201, 404, 403, 403, 403), request: async () => ({ path: `/api/blocks/${await w.draftBlock()}/photos`, photo: w.png }) },
  {
    route: 'GET /api/blocks/:id/photos/:photoId',
    case: 'open block, bearer',
    expect: s(401, 200, 404, 200, 200, 404),
    request: () => ({ path: `/api/blocks/${shared.open.blockId}/photos/${shared.open.photo.id}` }),
  },
  {
    route: 'GET /api/blocks/:id/photos/:photoId',
    case: 'draft block, bearer',
    expect: s(401, 200, 404, 404, 404, 404),
    request: () => ({ path: `/api/blocks/${shared.draft.blockId}/photos/${shared.draft.photoId}` }),
  },
  {
    route: 'GET /api/blocks/:id/photos/:photoId',
    case: "the owner's signed link, no bearer",
    expect: everyone(200),
    request: () => ({ path: shared.open.photo.url, headers: {} }),
  },
  {
    route: 'GET /api/blocks/:id/photos/:photoId',
    case: 'a link signed for another photo',
    expect: everyone(401),
    request: () => {
      const forged = jwt.sign({ typ: 'photo', pid: 'another-photo', bid: shared.open.blockId }, TEST_TOKENS.secret, { subject: w.person('owner').user.id, expiresIn: 600 });
      return { path: `/api/blocks/${shared.open.blockId}/photos/${shared.open.photo.id}?access=${forged}`, headers: {} };
    },
  },
  {
    route: 'DELETE /api/blocks/:id/photos/:photoId',
    case: 'fresh draft with a photo',
    expect: s(401, 204, 404, 403, 403, 403),
    request: async () => {
      const blockId = await w.draftBlock();
      return { path: `/api/blocks/${blockId}/photos/${(await w.photo(blockId)).id}` };
    },
  },

  // ——— bids ———
  { route: 'POST /api/blocks/:id/bids', case: 'fresh open block', expect: s(401, 403, 403, 201, 201, 403), request: async () => ({ path: `/api/blocks/${await w.openBlock()}/bids`, body: bidBody() }) },
  { route: 'POST /api/blocks/:id/bids', case: 'draft block', expect: s(401, 403, 403, 404, 404, 403), request: async () => ({ path: `/api/blocks/${shared.draft.blockId}/bids`, body: bidBody() }) },
  {
    route: 'GET /api/blocks/:id/bids',
    expect: s(401, 200, 404, 200, 200, 404),
    request: () => ({ path: `/api/blocks/${shared.open.blockId}/bids` }),
    check: (res, actor) => {
      const { partyBidId, rivalBidId } = shared.open;
      // The owner compares every bid; a grazier sees only their own, never a rival's price.
      expect(ids(res).sort()).toEqual(actor === 'owner' ? [partyBidId, rivalBidId].sort() : actor === 'party' ? [partyBidId] : [rivalBidId]);
    },
  },
  {
    route: 'GET /api/bids',
    expect: s(401, 403, 403, 200, 200, 403),
    request: () => ({ path: '/api/bids' }),
    check: (res, actor) => {
      expect(ids(res)).toContain(actor === 'party' ? shared.open.partyBidId : shared.open.rivalBidId);
      expect(ids(res)).not.toContain(actor === 'party' ? shared.open.rivalBidId : shared.open.partyBidId);
    },
  },
  { route: 'GET /api/bids/:id', case: "the party's bid", expect: s(401, 200, 404, 200, 404, 404), request: () => ({ path: `/api/bids/${shared.open.partyBidId}` }) },
  { route: 'PATCH /api/bids/:id', case: "fresh bid of the party's", expect: s(401, 403, 403, 200, 404, 403), request: async () => ({ path: `/api/bids/${(await w.bids(await w.openBlock())).partyBidId}`, body: { headCount: 550 } }) },
  { route: 'POST /api/bids/:id/withdraw', case: "fresh bid of the party's", expect: s(401, 403, 403, 200, 404, 403), request: async () => ({ path: `/api/bids/${(await w.bids(await w.openBlock())).partyBidId}/withdraw` }) },
  { route: 'POST /api/bids/:id/award', case: "fresh bid of the party's", expect: s(401, 201, 404, 403, 403, 403), request: async () => ({ path: `/api/bids/${(await w.bids(await w.openBlock())).partyBidId}/award` }) },

  // ——— contracts ———
  {
    route: 'GET /api/contracts',
    expect: s(401, 200, 200, 200, 200, 200),
    request: () => ({ path: '/api/contracts' }),
    check: (res, actor) => {
      if (actor === 'owner' || actor === 'party') expect(ids(res)).toContain(shared.contract.contractId);
      else expect(ids(res)).toEqual([]);
    },
  },
  { route: 'GET /api/contracts/:id', expect: s(401, 200, 404, 200, 404, 200), request: () => ({ path: `/api/contracts/${shared.contract.contractId}` }) },
  {
    route: 'POST /api/contracts/:id/sign',
    case: 'fresh contract to sign',
    expect: s(401, 200, 404, 200, 404, 403),
    request: async (actor) => {
      const { contractId } = await w.toSign();
      return { path: `/api/contracts/${contractId}/sign`, body: await w.signBody(w.person(actor === 'out' ? 'owner' : actor), contractId) };
    },
  },
  { route: 'POST /api/contracts/:id/cancel', case: 'fresh contract to sign', expect: s(401, 200, 404, 200, 404, 403), request: async () => ({ path: `/api/contracts/${(await w.toSign()).contractId}/cancel`, body: { reason: 'The frost took the feed' } }) },
  {
    route: 'POST /api/contracts/:id/amendments',
    case: 'fresh contract to sign',
    expect: s(401, 201, 404, 201, 404, 403),
    request: async () => ({ path: `/api/contracts/${(await w.toSign()).contractId}/amendments`, body: { headCount: 550, reason: 'Fifty ewes sold' } }),
  },
  {
    route: 'POST /api/contracts/:id/amendments/:amendmentId/withdraw',
    case: "fresh amendment of the owner's",
    expect: s(401, 200, 404, 403, 404, 403),
    request: async () => {
      const a = await w.withAmendment();
      return { path: `/api/contracts/${a.contractId}/amendments/${a.amendmentId}/withdraw` };
    },
  },
  {
    route: 'POST /api/contracts/:id/amendments/:amendmentId/decline',
    case: "fresh amendment of the owner's",
    expect: s(401, 403, 404, 200, 404, 403),
    request: async () => {
      const a = await w.withAmendment();
      return { path: `/api/contracts/${a.contractId}/amendments/${a.amendmentId}/decline` };
    },
  },
  { route: 'GET /api/contracts/:id/log', expect: s(401, 200, 404, 200, 404, 200), at: LOG_NOW, request: () => ({ path: `/api/contracts/${shared.contract.contractId}/log` }) },
  {
    route: 'POST /api/contracts/:id/log',
    case: 'an observation on the grazing contract',
    expect: s(401, 201, 404, 201, 404, 403),
    at: LOG_NOW,
    request: () => ({ path: `/api/contracts/${shared.contract.contractId}/log`, body: { clientId: crypto.randomUUID(), kind: 'observation', at: '2027-01-18T10:00:00-08:00', note: 'Fence line walked' } }),
  },
  {
    route: 'POST /api/contracts/:id/log/:entryId/void',
    case: "fresh observation of the party's",
    expect: s(401, 403, 404, 200, 404, 403),
    at: LOG_NOW,
    request: async () => {
      w.t.setNow(LOG_NOW);
      return { path: `/api/contracts/${shared.contract.contractId}/log/${await w.observation(shared.contract.contractId)}/void`, body: { reason: 'Logged on the wrong contract' } };
    },
  },
  {
    route: 'POST /api/contracts/:id/log/:entryId/photos',
    case: "fresh observation of the party's",
    expect: s(401, 403, 404, 201, 404, 403),
    at: LOG_NOW,
    request: async () => {
      w.t.setNow(LOG_NOW);
      return { path: `/api/contracts/${shared.contract.contractId}/log/${await w.observation(shared.contract.contractId)}/photos`, photo: w.png };
    },
  },
  {
    route: 'GET /api/contracts/:id/log/:entryId/photos/:photoId',
    expect: s(401, 200, 404, 200, 404, 200),
    at: LOG_NOW,
    request: () => ({ path: `/api/contracts/${shared.contract.contractId}/log/${shared.contract.entryId}/photos/${shared.contract.photoId}` }),
  },
  { route: 'POST /api/contracts/:id/sign-off', case: 'propose on a fresh grazed contract', expect: s(401, 403, 404, 200, 404, 403), at: LOG_NOW, request: async () => ({ path: `/api/contracts/${(await w.grazed()).contractId}/sign-off`, body: { action: 'propose' } }) },
  { route: 'POST /api/contracts/:id/sign-off', case: 'approve a fresh proposal', expect: s(401, 200, 404, 403, 404, 403), at: LOG_NOW, request: async () => ({ path: `/api/contracts/${(await w.proposed()).contractId}/sign-off`, body: { action: 'approve' } }) },
  { route: 'GET /api/contracts/:id/log.pdf', expect: s(401, 200, 404, 200, 404, 200), at: LOG_NOW, request: () => ({ path: `/api/contracts/${shared.contract.contractId}/log.pdf` }) },

  // ——— invoices and payment ———
  { route: 'POST /api/contracts/:id/invoice', case: 'fresh agreed contract', expect: s(401, 403, 403, 201, 404, 403), request: async () => ({ path: `/api/contracts/${(await w.agreed()).contractId}/invoice`, body: {} }) },
  {
    route: 'GET /api/invoices',
    expect: s(401, 200, 200, 200, 200, 200),
    request: () => ({ path: '/api/invoices' }),
    check: (res, actor) => {
      if (actor === 'owner' || actor === 'party') expect(ids(res)).toContain(shared.invoice.invoiceId);
      else expect(ids(res)).toEqual([]);
    },
  },
  { route: 'GET /api/invoices/:id', expect: s(401, 200, 404, 200, 404, 404), request: () => ({ path: `/api/invoices/${shared.invoice.invoiceId}` }) },
  { route: 'GET /api/invoices/:id/pdf', case: 'bearer', expect: s(401, 200, 404, 200, 404, 404), request: () => ({ path: `/api/invoices/${shared.invoice.invoiceId}/pdf` }) },
  { route: 'GET /api/invoices/:id/pdf', case: "the party's signed link, no bearer", expect: everyone(200), request: () => ({ path: shared.invoice.pdfUrl, headers: {} }) },
  {
    route: 'GET /api/invoices/:id/pdf',
    case: 'a link signed for another invoice',
    expect: everyone(401),
    request: () => {
      const forged = jwt.sign({ typ: 'invoice-pdf', iid: 'another-invoice' }, TEST_TOKENS.secret, { subject: w.person('party').user.id, expiresIn: 600 });
      return { path: `/api/invoices/${shared.invoice.invoiceId}/pdf?access=${forged}`, headers: {} };
    },
  },
  { route: 'POST /api/invoices/:id/pay', case: 'fresh sent invoice', expect: s(401, 200, 404, 403, 403, 403), request: async () => ({ path: `/api/invoices/${(await w.sentInvoice()).invoiceId}/pay`, body: { paymentMethod: 'pm_card_visa' } }) },
  { route: 'POST /api/invoices/:id/void', case: 'fresh sent invoice', expect: s(401, 403, 403, 200, 404, 403), request: async () => ({ path: `/api/invoices/${(await w.sentInvoice()).invoiceId}/void` }) },
  // A sign-in is no signature: only the payments API's signature opens the webhook (see the test below).
  { route: 'POST /api/webhooks/payments', case: 'no signature', expect: everyone(400), request: () => ({ path: '/api/webhooks/payments', body: { id: 'evt_forged', type: 'invoice.paid' } }) },
];

/** `/api/blocks/:id/photos/:photoId` → a regexp the concrete path (and its query) must match. */
function routePattern(path: string): RegExp {
  const body = path
    .split('/')
    .map((seg) => (seg.startsWith(':') ? '[^/?]+' : seg.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')))
    .join('/');
  return new RegExp(`^${body}(\\?.*)?$`);
}

async function send(row: Row, req: Req, actor: Actor): Promise<Response> {
  const [method, path] = row.route.split(' ');
  // The row must exercise its own route: a mistyped path would get the router's 404 and pass a 404 cell.
  expect(req.path).toMatch(routePattern(path));
  const api = w.api() as unknown as Record<string, (url: string) => import('supertest').Test>;
  let r = api[method.toLowerCase()](req.path).set(req.headers ?? w.auth(actor));
  if (req.photo) r = r.attach('photo', req.photo, { filename: 'photo.png', contentType: 'image/png' });
  else if (req.body !== undefined) r = r.send(req.body as object);
  return r;
}

describe('Authorisation matrix', () => {
  it('When the app is built, then every route it answers has a row and every row names a route it answers', () => {
    const routes = listRoutes(w.t.app);
    const rowed = new Set(ROWS.map((r) => r.route));
    expect(routes.filter((r) => !rowed.has(r))).toEqual([]);
    expect([...rowed].filter((r) => !routes.includes(r))).toEqual([]);
    expect(routes.length).toBeGreaterThanOrEqual(47);
  });

  it.each(ROWS.map((row) => [`${row.route}${row.case ? ` (${row.case})` : ''}`, row] as const))('%s', async (_name, row) => {
    const got = {} as Statuses;
    for (const actor of ACTORS) {
      w.resetClock();
      const req = await row.request(actor);
      if (row.at) w.t.setNow(row.at);
      // Mail the fixtures queued is sent first, so the sender's own writes are not taken for the request's.
      await w.t.deliverMail();
      const before = await dbFingerprint(w.t.dataSource);
      const res = await send(row, req, actor);
      got[actor] = res.status;
      if (res.status >= 400) {
        expect(res.body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
        expect(res.body.error.message).not.toMatch(/^No route for/);
        // A refusal changes nothing: no row written, no mail queued.
        await w.t.deliverMail();
        expect({ actor, changed: changedTables(before, await dbFingerprint(w.t.dataSource)) }).toEqual({ actor, changed: [] });
      }
      if (res.status < 300 && row.check) row.check(res, actor);
    }
    w.resetClock();
    expect(got).toEqual(row.expect);
  });

  it('When the payments API signs a delivery, then the webhook takes it; a wrong or missing signature gets 400 and changes nothing', async () => {
    const row = await w.t.dataSource.getRepository(Invoice).findOneByOrFail({ id: shared.invoice.invoiceId });
    const [event] = w.t.eventsFor(row.providerInvoiceId!);
    const { payload, signature } = w.t.fake.signedDelivery(event.id);
    const post = () => w.api().post('/api/webhooks/payments').set('Content-Type', 'application/json');
    const wrong = signature.replace(/v1=([0-9a-f])/, (_m, c: string) => `v1=${c === '0' ? '1' : '0'}`);
    for (const res of [await post().send(payload), await post().set('Stripe-Signature', wrong).send(payload), await post().set('Stripe-Signature', 't=1,v1=00').send(payload)]) {
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('bad_signature');
    }
    const good = await post().set('Stripe-Signature', signature).send(payload);
    expect(good.status).toBe(200);
    expect(good.body.received).toBe(true);
  });
});

import crypto from 'node:crypto';
import fc from 'fast-check';
import type { Response, Test } from 'supertest';
import { changedTables, dbFingerprint } from '../helpers/db-fingerprint';
import { hostileBody, hostileId, hostileKey, hostileQuery, hostileQueryValue, Obj, queryString, serialise, type Json, type QueryPairs } from '../helpers/hostile';
import { WEBHOOK_SECRET } from '../helpers/invoicing';
import { bidBody, blockBody } from '../helpers/market';
import { listRoutes } from '../helpers/routes';
import { LOG_NOW, PASSWORD, trustWorld, type Actor, type TrustWorld } from '../helpers/trust-world';
import { Invoice } from '../../server/modules/invoices/invoice.entity';
import { MAX_SAMPLES } from '../../lib/schemas/calc';

// Hostile input, as properties (fast-check): every route that reads a body or a query gets wrong types, missing
// and extra fields, huge strings and arrays, NaN/Infinity/-0/huge numbers, impossible dates, control and bidi
// characters, prototype keys (top level and nested), SQL- and HTML-looking text, sent by the person the route is
// for. Every answer is below 500 and comes within a second; a 4xx has the API's error shape, a 400 for invalid
// input names a field, and a refusal changes nothing that was stored (every table, row by row); text the server
// accepts it stores exactly as sent. Afterwards Object.prototype is as it was. Every route of the built app is
// either in TARGETS or in NO_INPUT (with the reason), so a new route fails here until it is classified.

jest.setTimeout(process.env.HOSTILE_RUNS ? 1_800_000 : 120_000);

/** Runs per route: enough to meet every kind of value over the suite's routes, small enough for < 60 s. HOSTILE_RUNS=500 searches deeper. */
const RUNS = Number(process.env.HOSTILE_RUNS ?? 24);
/** No request may hold the server longer than this. */
const BOUND_MS = 1_000;

interface Setup {
  path: string;
  body?: Record<string, unknown>;
  query?: Record<string, string>;
}
interface Target {
  route: string;
  who: Actor;
  /** json: a JSON body; query: the query string; multipart: a photo upload. */
  input: 'json' | 'query' | 'multipart';
  at?: string;
  setup: () => Promise<Setup>;
  /** Where the stored record is in a 2xx answer, and its free-text fields (which must come back exactly as sent). */
  echo?: { record: (res: Response) => Record<string, unknown>; text: string[]; status?: number };
  /** Sign each body as the payments API does (the webhook). */
  signed?: boolean;
  runs?: number;
}

let w: TrustWorld;

const TARGETS: Target[] = [
  {
    route: 'POST /api/auth/register',
    who: 'out',
    input: 'json',
    setup: async () => ({ path: '/api/auth/register', body: { email: 'hostile-new@trust.example', password: PASSWORD, name: 'Nell Newcomer', roles: ['grower', 'grazier'] } }),
  },
  { route: 'POST /api/auth/login', who: 'out', input: 'json', setup: async () => ({ path: '/api/auth/login', body: { email: w.person('rival').email, password: PASSWORD } }) },
  { route: 'POST /api/auth/password-reset', who: 'out', input: 'json', setup: async () => ({ path: '/api/auth/password-reset', body: { email: w.person('rival').email } }) },
  {
    route: 'POST /api/auth/password-reset/confirm',
    who: 'out',
    input: 'json',
    setup: async () => ({ path: '/api/auth/password-reset/confirm', body: { token: 'f'.repeat(64), password: 'a new long password' } }),
  },
  {
    route: 'PATCH /api/me',
    who: 'admin',
    input: 'json',
    setup: async () => ({
      path: '/api/me',
      body: { name: 'Opal Operator', businessName: 'Fieldfold', phone: '+1 530 555 0100', homePlace: 'Calder Valley', homeLatitude: 39.7, homeLongitude: -121.9, flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 600, bodyWeightLb: 150 } },
    }),
    echo: { record: (res) => res.body.user, text: ['name', 'businessName', 'homePlace'] },
  },
  { route: 'POST /api/calc/forage', who: 'out', input: 'json', setup: async () => ({ path: '/api/calc/forage', body: { frameAreaM2: 0.25, samples: [{ freshGrams: 220, dryMatterPct: 28 }, { dryGrams: 60 }] } }) },
  {
    route: 'POST /api/calc/capacity',
    who: 'out',
    input: 'json',
    setup: async () => ({ path: '/api/calc/capacity', body: { acres: 80, lbDmPerAcre: 2000, utilizationPct: 45, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } } }),
  },
  {
    route: 'POST /api/calc/head-days',
    who: 'out',
    input: 'json',
    setup: async () => ({
      path: '/api/calc/head-days',
      body: { moves: [{ at: '2027-01-10T08:00:00-08:00', change: 600 }, { at: '2027-01-20T08:00:00-08:00', change: -600 }], until: '2027-01-21T08:00:00-08:00', timeZone: 'America/Los_Angeles' },
    }),
  },
  {
    route: 'POST /api/calc/charge',
    who: 'out',
    input: 'json',
    setup: async () => ({ path: '/api/calc/charge', body: { basis: 'head-day', quantity: 6000, rate: '0.18', feesCents: [{ label: 'Trucking', amountCents: 45_000 }] } }),
  },
  { route: 'POST /api/blocks', who: 'owner', input: 'json', setup: async () => ({ path: '/api/blocks', body: blockBody({ notes: 'Gate code at the shed' }) }), echo: { record: (res) => res.body.block, text: ['name', 'placeName', 'notes'] } },
  {
    route: 'GET /api/blocks',
    who: 'party',
    input: 'query',
    setup: async () => ({ path: '/api/blocks', query: { view: 'market', from: '2027-01-01', to: '2027-03-31', maxMiles: '50', minAcres: '10', maxAcres: '500', minDays: '3', species: 'sheep', sort: 'distance', page: '1', pageSize: '20' } }),
  },
  {
    route: 'PATCH /api/blocks/:id',
    who: 'owner',
    input: 'json',
    setup: async () => ({ path: `/api/blocks/${await w.draftBlock()}`, body: { name: 'South bench walnut middles', acres: 60, windowStart: '2027-01-05', notes: 'Dogs on site', speciesAllowed: ['sheep'] } }),
    echo: { record: (res) => res.body.block, text: ['name', 'notes'] },
  },
  { route: 'POST /api/blocks/:id/photos', who: 'owner', input: 'multipart', setup: async () => ({ path: `/api/blocks/${await w.draftBlock()}/photos` }) },
  {
    route: 'GET /api/blocks/:id/photos/:photoId',
    who: 'out',
    input: 'query',
    setup: async () => {
      const blockId = await w.openBlock();
      const photo = await w.photo(blockId);
      return { path: `/api/blocks/${blockId}/photos/${photo.id}`, query: { access: new URL(photo.url, 'http://x').searchParams.get('access')! } };
    },
  },
  {
    route: 'POST /api/blocks/:id/bids',
    who: 'party',
    input: 'json',
    setup: async () => ({ path: `/api/blocks/${await w.openBlock()}/bids`, body: bidBody({ note: 'Guardian dogs stay with the flock' }) }),
    echo: { record: (res) => res.body.bid, text: ['note'] },
  },
  {
    route: 'GET /api/blocks/:id/bids',
    who: 'owner',
    input: 'query',
    setup: async () => {
      const blockId = await w.openBlock();
      await w.bids(blockId);
      return { path: `/api/blocks/${blockId}/bids`, query: { status: 'live', page: '1', pageSize: '10' } };
    },
  },
  { route: 'GET /api/bids', who: 'party', input: 'query', setup: async () => ({ path: '/api/bids', query: { status: 'live', page: '1', pageSize: '10' } }) },
  {
    route: 'PATCH /api/bids/:id',
    who: 'party',
    input: 'json',
    setup: async () => ({ path: `/api/bids/${(await w.bids(await w.openBlock())).partyBidId}`, body: { headCount: 550, rate: '0.2', endDate: '2027-01-26', note: 'Fewer ewes this year' } }),
    echo: { record: (res) => res.body.bid, text: ['note'] },
  },
  { route: 'GET /api/contracts', who: 'party', input: 'query', setup: async () => ({ path: '/api/contracts', query: { status: 'to-sign', limit: '10' } }) },
  {
    route: 'POST /api/contracts/:id/sign',
    who: 'party',
    input: 'json',
    setup: async () => {
      const { contractId } = await w.toSign();
      return { path: `/api/contracts/${contractId}/sign`, body: await w.signBody(w.person('party'), contractId) };
    },
  },
  { route: 'POST /api/contracts/:id/cancel', who: 'party', input: 'json', setup: async () => ({ path: `/api/contracts/${(await w.toSign()).contractId}/cancel`, body: { reason: 'The truck broke down' } }) },
  {
    route: 'POST /api/contracts/:id/amendments',
    who: 'owner',
    input: 'json',
    setup: async () => ({ path: `/api/contracts/${(await w.toSign()).contractId}/amendments`, body: { headCount: 550, startDate: '2027-01-11', endDate: '2027-01-27', outBy: '2027-02-28', basis: 'head-day', rate: '0.2', reason: 'Less feed after the frost' } }),
  },
  {
    route: 'GET /api/contracts/:id/log',
    who: 'party',
    input: 'query',
    at: LOG_NOW,
    setup: async () => ({ path: `/api/contracts/${(await w.grazing()).contractId}/log`, query: { limit: '10' } }),
  },
  {
    route: 'POST /api/contracts/:id/log',
    who: 'party',
    input: 'json',
    at: LOG_NOW,
    setup: async () => ({
      path: `/api/contracts/${(await w.grazing()).contractId}/log`,
      body: { clientId: crypto.randomUUID(), kind: 'tally', at: '2027-01-15T09:00:00-08:00', count: 600, paddock: 'North cell', residualHeightIn: 4, takenPct: 40, waterChecked: true, fenceChecked: true, losses: 0, note: 'Counted at the gate' },
    }),
    // A 200 is a replay of a client id already stored: it answers with the stored entry (stored once), so only a 201 echoes.
    echo: { record: (res) => res.body.entry, text: ['paddock', 'note'], status: 201 },
  },
  {
    route: 'POST /api/contracts/:id/log/:entryId/void',
    who: 'party',
    input: 'json',
    at: LOG_NOW,
    setup: async () => {
      const { contractId } = await w.grazing();
      return { path: `/api/contracts/${contractId}/log/${await w.observation(contractId)}/void`, body: { reason: 'Logged on the wrong block' } };
    },
  },
  {
    route: 'POST /api/contracts/:id/log/:entryId/photos',
    who: 'party',
    input: 'multipart',
    at: LOG_NOW,
    setup: async () => {
      const { contractId } = await w.grazing();
      return { path: `/api/contracts/${contractId}/log/${await w.observation(contractId)}/photos` };
    },
  },
  {
    route: 'GET /api/contracts/:id/log/:entryId/photos/:photoId',
    who: 'out',
    input: 'query',
    at: LOG_NOW,
    setup: async () => {
      const { contractId } = await w.grazing();
      const entryId = await w.observation(contractId);
      const photo = await w.logPhoto(contractId, entryId);
      return { path: `/api/contracts/${contractId}/log/${entryId}/photos/${photo.id}`, query: { access: new URL(photo.url, 'http://x').searchParams.get('access')! } };
    },
  },
  { route: 'POST /api/contracts/:id/sign-off', who: 'party', input: 'json', at: LOG_NOW, setup: async () => ({ path: `/api/contracts/${(await w.grazed()).contractId}/sign-off`, body: { action: 'propose', comment: 'All out on the 20th' } }) },
  { route: 'POST /api/contracts/:id/invoice', who: 'party', input: 'json', setup: async () => ({ path: `/api/contracts/${(await w.agreed()).contractId}/invoice`, body: { paymentTermsDays: 14 } }) },
  { route: 'GET /api/invoices', who: 'party', input: 'query', setup: async () => ({ path: '/api/invoices', query: { side: 'receivable', limit: '10' } }) },
  {
    route: 'GET /api/invoices/:id/pdf',
    who: 'out',
    input: 'query',
    setup: async () => {
      const inv = await w.sentInvoice();
      return { path: `/api/invoices/${inv.invoiceId}/pdf`, query: { access: new URL(inv.pdfUrl, 'http://x').searchParams.get('access')! } };
    },
  },
  { route: 'POST /api/invoices/:id/pay', who: 'owner', input: 'json', setup: async () => ({ path: `/api/invoices/${(await w.sentInvoice()).invoiceId}/pay`, body: { paymentMethod: 'pm_card_visa' } }) },
  {
    route: 'POST /api/webhooks/payments',
    who: 'out',
    input: 'json',
    signed: true,
    runs: 60,
    setup: async () => {
      const inv = await w.sentInvoice();
      const row = await w.t.dataSource.getRepository(Invoice).findOneByOrFail({ id: inv.invoiceId });
      const event = w.t.eventsFor(row.providerInvoiceId!, 'invoice.finalized')[0];
      // The members the app reads, so the properties hit them rather than the event's many others.
      const e = JSON.parse(w.t.fake.signedDelivery(event.id).payload);
      const o = e.data.object;
      const invoice = { id: o.id, object: o.object, customer: o.customer, number: o.number, status: o.status, total: o.total, amount_due: o.amount_due, amount_paid: o.amount_paid, status_transitions: o.status_transitions, metadata: o.metadata };
      return { path: '/api/webhooks/payments', body: { id: `${e.id}_hostile`, object: 'event', type: 'invoice.paid', created: e.created, data: { object: invoice } } };
    },
  },
];

/** Routes that read neither a body nor a query: what they act on is the path and the signed-in person. */
const NO_INPUT: Record<string, string> = {
  'GET /api/health': 'nothing to read',
  'POST /api/auth/logout': 'the session comes from the token',
  'POST /api/auth/refresh': 'the session comes from the token',
  'GET /api/me': 'the account comes from the token',
  'GET /api/blocks/:id': 'the path only',
  'POST /api/blocks/:id/publish': 'the path only',
  'POST /api/blocks/:id/withdraw': 'the path only',
  'DELETE /api/blocks/:id/photos/:photoId': 'the path only',
  'GET /api/bids/:id': 'the path only',
  'POST /api/bids/:id/withdraw': 'the path only',
  'POST /api/bids/:id/award': 'the path only',
  'GET /api/contracts/:id': 'the path only',
  'POST /api/contracts/:id/amendments/:amendmentId/withdraw': 'the path only',
  'POST /api/contracts/:id/amendments/:amendmentId/decline': 'the path only',
  'GET /api/contracts/:id/log.pdf': 'the path only (If-None-Match aside)',
  'GET /api/invoices/:id': 'the path only',
  'POST /api/invoices/:id/void': 'the path only',
};

let protoBefore: string[];
beforeAll(async () => {
  protoBefore = Object.getOwnPropertyNames(Object.prototype).sort();
  w = await trustWorld();
});
afterAll(async () => {
  await w?.t.close();
});

/** The checks every answer must pass; `before` is the store as it was before the request. */
async function assertAnswer(what: string, res: Response, elapsedMs: number, before: Record<string, string>) {
  const body = res.body as { error?: { code?: unknown; message?: unknown; fields?: unknown } };
  expect({ what, status: res.status < 500 ? 'below 500' : res.status, body: res.status < 500 ? null : body }).toEqual({ what, status: 'below 500', body: null });
  expect({ what, slow: elapsedMs >= BOUND_MS ? elapsedMs : false }).toEqual({ what, slow: false });
  if (res.status < 400) return;
  expect(body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
  if (res.status === 400 && body.error?.code === 'invalid_input') {
    const fields = body.error.fields as Record<string, unknown> | undefined;
    expect({ what, fields: fields && typeof fields === 'object' && Object.keys(fields).length > 0 && Object.values(fields).every((v) => typeof v === 'string') }).toEqual({ what, fields: true });
  }
  await w.t.deliverMail();
  expect({ what, changed: changedTables(before, await dbFingerprint(w.t.dataSource)) }).toEqual({ what, changed: [] });
}

async function timed(req: Test): Promise<{ res: Response; ms: number }> {
  const started = performance.now();
  const res = await req;
  return { res, ms: performance.now() - started };
}

function topLevelText(j: Json): Record<string, string> {
  const out: Record<string, string> = {};
  if (j instanceof Obj) for (const [k, v] of j.entries) if (typeof v === 'string') out[k] = v;
  return out;
}

type Part = { kind: 'file'; field: string; bytes: Buffer; filename: string; type: string } | { kind: 'field'; name: string; value: string };

function multipartParts(png: Buffer): fc.Arbitrary<Part[]> {
  const file = fc.record({
    kind: fc.constant('file' as const),
    field: fc.oneof(fc.constant('photo'), hostileKey().filter((k) => k !== '')),
    bytes: fc.constantFrom(png, Buffer.from('not an image at all'), Buffer.alloc(0), Buffer.concat([png.subarray(0, 8), Buffer.alloc(64, 0xff)]), Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>')),
    filename: fc.constantFrom('photo.png', '../../etc/passwd', '<script>alert(1)</script>.png', `${'x'.repeat(300)}.png`, '😀.png', '.png', 'photo.php.png'),
    type: fc.constantFrom('image/png', 'text/html', 'application/octet-stream', 'image/svg+xml'),
  });
  const field = fc.record({ kind: fc.constant('field' as const), name: hostileKey().filter((k) => k !== ''), value: hostileQueryValue() });
  return fc.array(fc.oneof({ arbitrary: file, weight: 3 }, { arbitrary: field, weight: 1 }), { maxLength: 3 });
}

describe('Hostile input', () => {
  it('When the app is built, then every route is either a hostile-input target or reads no input', () => {
    const routes = listRoutes(w.t.app);
    const classified = [...TARGETS.map((t) => t.route), ...Object.keys(NO_INPUT)];
    expect(routes.filter((r) => !classified.includes(r))).toEqual([]);
    expect(classified.filter((r) => !routes.includes(r))).toEqual([]);
    expect(new Set(classified).size).toBe(classified.length);
  });

  it.each(TARGETS.map((t) => [t.route, t] as const))('%s: hostile input gets a 4xx naming the field, never a 500, and changes nothing', async (_name, target) => {
    w.resetClock();
    const setup = await target.setup();
    if (target.at) w.t.setNow(target.at);
    const [method] = target.route.split(' ');
    const api = w.api() as unknown as Record<string, (url: string) => Test>;
    const auth = w.auth(target.who);

    async function run(make: () => Test, what: string, sent?: Json) {
      await w.t.deliverMail();
      const before = await dbFingerprint(w.t.dataSource);
      const { res, ms } = await timed(make());
      await assertAnswer(what, res, ms, before);
      if (res.status < 300 && target.echo && (target.echo.status ?? res.status) === res.status && sent !== undefined) {
        const record = target.echo.record(res);
        const text = topLevelText(sent);
        for (const f of target.echo.text) if (f in text) expect({ what, field: f, stored: record[f] }).toEqual({ what, field: f, stored: text[f] });
      }
    }

    if (target.input === 'json') {
      await fc.assert(
        fc.asyncProperty(hostileBody(setup.body!), async (j) => {
          const text = serialise(j);
          let req = api[method.toLowerCase()](setup.path).set(auth).set('Content-Type', 'application/json');
          if (target.signed) req = req.set('Stripe-Signature', w.t.stripe.webhooks.generateTestHeaderString({ payload: text, secret: WEBHOOK_SECRET }));
          await run(() => req.send(text), `${target.route} ${text.slice(0, 300)}`, j);
        }),
        { numRuns: Math.max(target.runs ?? 0, RUNS) },
      );
    } else if (target.input === 'query') {
      await fc.assert(
        fc.asyncProperty(hostileQuery(setup.query!), async (pairs: QueryPairs) => {
          const qs = queryString(pairs);
          await run(() => api[method.toLowerCase()](`${setup.path}${qs}`).set(auth), `${target.route} ${qs.slice(0, 300)}`);
        }),
        { numRuns: RUNS },
      );
    } else {
      await fc.assert(
        fc.asyncProperty(fc.oneof(multipartParts(w.png), hostileBody({}).map((j) => ({ json: j }))), async (parts) => {
          if (!Array.isArray(parts)) {
            const text = serialise(parts.json);
            await run(() => api.post(setup.path).set(auth).set('Content-Type', 'application/json').send(text), `${target.route} json ${text.slice(0, 200)}`);
            return;
          }
          await run(() => {
            let req = api.post(setup.path).set(auth);
            for (const p of parts) req = p.kind === 'file' ? req.attach(p.field, p.bytes, { filename: p.filename, contentType: p.type }) : req.field(p.name, p.value);
            if (parts.length === 0) req = req.type('form');
            return req;
          }, `${target.route} multipart ${JSON.stringify(parts.map((p) => (p.kind === 'file' ? { field: p.field, filename: p.filename, type: p.type, bytes: p.bytes.length } : p)))}`);
        }),
        { numRuns: RUNS },
      );
    }
    expect(Object.getOwnPropertyNames(Object.prototype).sort()).toEqual(protoBefore);
    w.resetClock();
  });

  it('When any route gets hostile ids in its path, then it answers a 4xx below 500 and changes nothing', async () => {
    const withParams = listRoutes(w.t.app).filter((r) => r.includes('/:'));
    for (const route of withParams) {
      const [method, pattern] = route.split(' ');
      const names = pattern.split('/').filter((s) => s.startsWith(':'));
      await fc.assert(
        fc.asyncProperty(fc.tuple(...names.map(() => hostileId())), fc.constantFrom<Actor>('owner', 'party'), async (ids, who) => {
          let i = 0;
          const path = pattern
            .split('/')
            .map((seg) => {
              if (!seg.startsWith(':')) return seg;
              const { raw, id } = ids[i++];
              return raw ? id : encodeURIComponent(id);
            })
            .join('/');
          await w.t.deliverMail();
          const before = await dbFingerprint(w.t.dataSource);
          const api = w.api() as unknown as Record<string, (url: string) => Test>;
          let req = api[method.toLowerCase()](path).set(w.auth(who));
          if (method !== 'GET' && method !== 'DELETE') req = req.set('Content-Type', 'application/json').send('{}');
          const { res, ms } = await timed(req);
          const what = `${method} ${path.slice(0, 200)} as ${who}`;
          expect({ what, status: res.status >= 400 && res.status < 500 }).toEqual({ what, status: true });
          await assertAnswer(what, res, ms, before);
        }),
        { numRuns: Math.ceil(RUNS / 4) },
      );
    }
  });

  it('When every hostile request has been answered, then no object has gained a property from a prototype key', () => {
    expect(Object.getOwnPropertyNames(Object.prototype).sort()).toEqual(protoBefore);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(Object.prototype.toString.call([])).toBe('[object Array]');
    expect(typeof ({} as { toString: unknown }).toString).toBe('function');
  });
});

// The cases the properties above found (each was a 500 or unbounded work), kept as plain examples.
describe('Hostile input: the cases the properties found', () => {
  const json = (path: string, text: string, auth: Record<string, string> = {}) => w.api().post(path).set(auth).set('Content-Type', 'application/json').send(text);
  const charge = '"basis":"head-day","quantity":6000,"rate":"0.18"';

  it('When a body has a key named like a member of every object, at any depth, then 400 names it as an unknown field', async () => {
    for (const [text, field] of [
      [`{${charge},"__proto__":null}`, '__proto__'],
      [`{${charge},"toString":1}`, 'toString'],
      [`{${charge},"constructor":{"prototype":{"polluted":"yes"}}}`, 'constructor'],
      [`{${charge},"feesCents":[{"label":"Hauling","amountCents":100,"hasOwnProperty":0}]}`, 'feesCents[0].hasOwnProperty'],
    ]) {
      const res = await json('/api/calc/charge', text);
      expect({ text, status: res.status, fields: res.body.error?.fields }).toEqual({ text, status: 400, fields: { [field]: `Unknown field: ${field.split('.').pop()}` } });
    }
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it('When a list query has a key named like an object member, then 400 names it', async () => {
    for (const key of ['__proto__', 'constructor', 'valueOf']) {
      const res = await w.api().get(`/api/blocks?${key}=1`).set(w.auth('party'));
      expect({ key, status: res.status, fields: res.body.error?.fields }).toEqual({ key, status: 400, fields: { [key]: `Unknown field: ${key}` } });
    }
  });

  it('When a block or a bid is patched with a __proto__ key, then 400 and the record is as it was', async () => {
    const blockId = await w.draftBlock();
    const { partyBidId } = await w.bids(await w.openBlock());
    // The bids' mail is sent first, so the sender's own writes are not taken for the requests'.
    await w.t.deliverMail();
    const before = await dbFingerprint(w.t.dataSource);
    const block = await w.api().patch(`/api/blocks/${blockId}`).set(w.auth('owner')).set('Content-Type', 'application/json').send('{"__proto__":{"name":"Renamed by the prototype"}}');
    const bid = await w.api().patch(`/api/bids/${partyBidId}`).set(w.auth('party')).set('Content-Type', 'application/json').send('{"note":"ok","__proto__":{"rate":"99"}}');
    // (An object literal's __proto__ would set its prototype: the expected field is made as the answer was, by JSON.parse.)
    const protoField = JSON.parse('{"__proto__":"Unknown field: __proto__"}');
    expect([block.status, block.body.error.fields, bid.status, bid.body.error.fields]).toEqual([400, protoField, 400, protoField]);
    expect(Object.keys(block.body.error.fields)).toEqual(['__proto__']);
    expect(changedTables(before, await dbFingerprint(w.t.dataSource))).toEqual([]);
  });

  it('When a body is JSON but not an object, then 400 names the body as a whole', async () => {
    const res = await json('/api/calc/forage', '[]');
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({ code: 'invalid_input', message: 'The request body must be a JSON object', fields: { _: 'Send the fields as one JSON object' } });
  });

  it('When a list is far longer than its cap, or an object has thousands of keys, then 400 at once, before any item is checked', async () => {
    const many = Array(30_000).fill(1).join(',');
    const keys = Array.from({ length: 10_000 }, (_, i) => `"k${i}":0`).join(',');
    for (const [path, text, field, message] of [
      ['/api/auth/register', `{"email":"a@trust.example","password":"${PASSWORD}","name":"Nell","roles":[${many}]}`, 'roles', 'Choose grower, grazier or both'],
      ['/api/calc/forage', `{"frameAreaM2":0.25,"samples":[${many}]}`, 'samples', `At most ${MAX_SAMPLES} samples`],
      ['/api/calc/charge', `{${charge},"feesCents":[${many}]}`, 'feesCents', 'At most 20 fees'],
      ['/api/calc/capacity', `{${keys}}`, '_', 'At most 100 fields'],
    ]) {
      const started = performance.now();
      const res = await json(path, text);
      expect({ path, ms: performance.now() - started < BOUND_MS, status: res.status, fields: res.body.error?.fields }).toEqual({ path, ms: true, status: 400, fields: { [field]: message } });
    }
  });

  it('When the head-days calculator is asked to count from year 1 to 9999, then 400 on until, at once', async () => {
    const started = performance.now();
    const res = await json('/api/calc/head-days', '{"moves":[{"at":"0001-01-01T00:00:00Z","change":5}],"until":"9999-12-31T00:00:00Z"}');
    expect(performance.now() - started).toBeLessThan(BOUND_MS);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['until']);
  });

  it('When an id in the path holds a NUL, raw or encoded, then 404 and nothing changes (PostgreSQL refuses a NUL in any text, which was a 500 there)', async () => {
    const before = await dbFingerprint(w.t.dataSource);
    for (const [method, path] of [
      ['get', '/api/blocks/%00/bids'],
      ['get', `/api/blocks/${encodeURIComponent('a\u0000b')}`],
      ['get', '/api/contracts/%00'],
      ['post', '/api/invoices/%00/pay'],
    ] as const) {
      const res = await w.api()[method](path).set(w.auth('owner')).set('Content-Type', 'application/json').send('{}');
      expect({ path, status: res.status, code: res.body.error?.code }).toEqual({ path, status: 404, code: 'not_found' });
    }
    expect(changedTables(before, await dbFingerprint(w.t.dataSource))).toEqual([]);
  });

  it('When a webhook is signed but is no event (a list, no data, a text timestamp, a text paid_at), then 400 bad_event and nothing is stored', async () => {
    const signed = (payload: string) =>
      w.api().post('/api/webhooks/payments').set('Content-Type', 'application/json').set('Stripe-Signature', w.t.stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET })).send(payload);
    const invoice = '{"id":"in_x","object":"invoice","customer":"cus_x","status":"paid","total":100,"amount_due":0,"amount_paid":100,"status_transitions":{"paid_at":"yesterday"}}';
    const before = await dbFingerprint(w.t.dataSource);
    for (const payload of ['[]', '{"id":"evt_1","type":"invoice.paid","created":1798761600}', '{"id":"evt_2","type":"invoice.paid","created":"now","data":{"object":{}}}', `{"id":"evt_3","type":"invoice.paid","created":1798761600,"data":{"object":${invoice}}}`]) {
      const res = await signed(payload);
      expect({ payload, status: res.status, code: res.body.error?.code }).toEqual({ payload, status: 400, code: 'bad_event' });
    }
    expect(changedTables(before, await dbFingerprint(w.t.dataSource))).toEqual([]);
  });
});

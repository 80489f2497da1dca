import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { MAX_FEES, MAX_MOVES, MAX_SAMPLES, MAX_SPAN_DAYS } from '../../lib/schemas/calc';

// The calculator answers without sign-in, so no request to it may hold the server: every input that grows the
// work has a ceiling in the shared schema, an over-long request is refused by its length before any work, and
// the largest request allowed is answered in a moment.

const DAY = 86_400_000;
const T0 = Date.UTC(2027, 0, 4, 15);
const at = (ms: number) => new Date(ms).toISOString();

/** `n` moves spread over `days`, in and out by turns (the count never drops below zero). */
const moves = (n: number, days = MAX_SPAN_DAYS) => Array.from({ length: n }, (_, i) => ({ at: at(T0 + Math.floor((i * days * DAY) / n)), change: i % 2 === 0 ? 40 : -40 }));
const samples = (n: number) => Array.from({ length: n }, (_, i) => (i % 2 ? { dryGrams: 10 + (i % 50) } : { freshGrams: 120 + (i % 70), dryMatterPct: 22 }));
const fees = (n: number) => Array.from({ length: n }, (_, i) => ({ label: `Haul ${i} `.padEnd(80, 'x'), amountCents: 4_000 + i }));

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeAll(async () => {
  t = await makeTestApp();
  // One request first: the first answer of a process pays for loading code.
  await request(t.app).post('/api/calc/charge').send({ basis: 'flat', rate: '1.00' });
});
afterAll(() => t.close());

/** The fastest of three tries, in ms: the machine may be busy with other work, the route's own cost is the least. */
async function fastest(url: string, body: object): Promise<{ ms: number; res: request.Response }> {
  let best: { ms: number; res: request.Response } | null = null;
  for (let i = 0; i < 3; i++) {
    const started = performance.now();
    const res = await request(t.app).post(url).send(body);
    const ms = performance.now() - started;
    if (!best || ms < best.ms) best = { ms, res };
  }
  return best!;
}

describe('Calculator limits', () => {
  it.each([
    ['samples', '/api/calc/forage', { frameAreaM2: 0.25, samples: samples(MAX_SAMPLES * 20) }, `At most ${MAX_SAMPLES} samples`],
    ['moves', '/api/calc/head-days', { moves: moves(MAX_MOVES * 3), until: at(T0 + MAX_SPAN_DAYS * DAY), timeZone: 'America/Los_Angeles' }, `At most ${MAX_MOVES} moves`],
    ['feesCents', '/api/calc/charge', { basis: 'head-day', quantity: 1000, rate: '0.18', feesCents: fees(MAX_FEES * 50) }, `At most ${MAX_FEES} fees`],
  ])('When %s are over the limit (but the body is within 200 kB), then 400 names the field in well under 100 ms', async (field, url, body, message) => {
    expect(JSON.stringify(body).length).toBeLessThan(200 * 1024);
    const { ms, res } = await fastest(url, body);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ [field]: message });
    expect(ms).toBeLessThan(100);
  });

  it('When the end time is more than 400 days after the first move (a century, say), then 400 names until in well under 100 ms', async () => {
    const { ms, res } = await fastest('/api/calc/head-days', { moves: [{ at: '2000-01-01T00:00:00Z', change: 5 }], until: '2100-12-31T00:00:00Z', timeZone: 'America/Los_Angeles' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ until: `End time must be at most ${MAX_SPAN_DAYS} days after the first move` });
    expect(ms).toBeLessThan(100);
    // Just inside the span is allowed.
    const inside = await request(t.app).post('/api/calc/head-days').send({ moves: [{ at: at(T0), change: 5 }], until: at(T0 + MAX_SPAN_DAYS * DAY) });
    expect(inside.status).toBe(200);
    expect(inside.body.headDays).toBe(5 * MAX_SPAN_DAYS);
  });

  it('When a time zone name is absurdly long, then 400 names it', async () => {
    const res = await request(t.app).post('/api/calc/head-days').send({ moves: [{ at: at(T0), change: 5 }], until: at(T0 + DAY), timeZone: `America/${'x'.repeat(50_000)}` });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['timeZone']);
  });

  it('When the largest head-day count allowed is asked for (1 000 moves over 400 days, split by day in a DST zone), then it is answered in a moment', async () => {
    const { ms, res } = await fastest('/api/calc/head-days', { moves: moves(MAX_MOVES), until: at(T0 + MAX_SPAN_DAYS * DAY), timeZone: 'America/Los_Angeles' });
    expect(res.status).toBe(200);
    expect(res.body.byDay.length).toBeGreaterThanOrEqual(MAX_SPAN_DAYS);
    // 40 head on for half the span, in 40-head stays: 40 × 200 days.
    expect(res.body.headDays).toBeCloseTo(40 * (MAX_SPAN_DAYS / 2), 4);
    // Measured 85–300 ms on this 2-core machine while other work ran (mostly yup checking 1 000 moves); the budget allows for that.
    expect(ms).toBeLessThan(400);
  });

  it('When the largest forage estimate and charge allowed are asked for, then they are answered in a moment', async () => {
    const forage = await fastest('/api/calc/forage', { frameAreaM2: 0.25, samples: samples(MAX_SAMPLES) });
    expect(forage.res.status).toBe(200);
    expect(forage.res.body.sampleCount).toBe(MAX_SAMPLES);
    expect(forage.ms).toBeLessThan(200);
    const charge = await fastest('/api/calc/charge', { basis: 'head-day', quantity: 999_999.9999, rate: '999.999999', feesCents: fees(MAX_FEES) });
    expect(charge.res.status).toBe(200);
    expect(charge.res.body.lines).toHaveLength(1 + MAX_FEES);
    expect(charge.ms).toBeLessThan(100);
  });
});

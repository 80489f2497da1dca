import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { forageFromSamples } from '../../lib/grazing/forage';
import { capacity } from '../../lib/grazing/capacity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(() => t.close());

const post = (path: string, body: unknown) => request(t.app).post(`/api/calc/${path}`).send(body as object);

describe('POST /api/calc/forage', () => {
  it('When three 0.25 m² quadrats are clipped (fresh with DM %, or oven-dry), then it answers lb and kg DM per area without sign-in', async () => {
    const body = { frameAreaM2: 0.25, samples: [{ freshGrams: 300, dryMatterPct: 20 }, { dryGrams: 50 }, { dryGrams: 70 }] };
    const res = await post('forage', body);
    expect(res.status).toBe(200);
    // mean 60 g per 0.25 m² = 240 g/m² = 2 400 kg/ha (×40 for a 0.25 m² quadrat: shared/TRADE.md)
    expect(res.body.meanDryGrams).toBeCloseTo(60, 10);
    expect(res.body.kgDmPerHa).toBeCloseTo(2400, 8);
    expect(res.body.sampleCount).toBe(3);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(forageFromSamples(body))));
  });

  it('When there are no samples, the frame is zero and a DM % is over 100, then 400 names each field', async () => {
    const res = await post('forage', { frameAreaM2: 0, samples: [] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('frameAreaM2');
    expect(res.body.error.fields).toHaveProperty('samples');
    const dm = await post('forage', { frameAreaM2: 0.25, samples: [{ freshGrams: 100, dryMatterPct: 140 }] });
    expect(dm.status).toBe(400);
    expect(Object.keys(dm.body.error.fields)).toEqual(['samples[0].dryMatterPct']);
  });
});

describe('POST /api/calc/capacity', () => {
  const body = { acres: 80, lbDmPerAcre: 2000, utilizationPct: 45, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } };

  it('When a block and an animal are given, then it answers the same figures as lib/grazing/capacity', async () => {
    const res = await post('capacity', body);
    expect(res.status).toBe(200);
    expect(res.body).toEqual(capacity(body));
    // 80 ac × 2 000 lb = 160 000 lb standing; 45 % = 72 000 lb; 150 lb × 2.5 % = 3.75 lb/head/day → 19 200 head-days.
    expect(res.body.standingLb).toBe(160000);
    expect(res.body.allowableLb).toBeCloseTo(72000, 8);
    expect(res.body.headDays).toBeCloseTo(19200, 8);
    expect(res.body.aum).toBeCloseTo(72000 / 26 / 30, 8);
  });

  it('When acres are negative, utilisation is over 100 % and body weight is a string, then 400 names each field', async () => {
    const res = await post('capacity', { ...body, acres: -3, utilizationPct: 120, animal: { bodyWeightLb: '150', intakePctBodyWeight: 2.5 } });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['acres', 'animal.bodyWeightLb', 'utilizationPct']);
  });
});

describe('POST /api/calc/head-days', () => {
  it('When 600 head go in and 200 come out, then head-days integrate the count over time with a daily breakdown', async () => {
    const res = await post('head-days', {
      moves: [
        { at: '2027-01-10T08:00:00-08:00', change: 600 },
        { at: '2027-01-11T20:00:00-08:00', change: -200 },
      ],
      until: '2027-01-12T08:00:00-08:00',
      timeZone: 'America/Los_Angeles',
    });
    expect(res.status).toBe(200);
    // 600 × 1.5 d + 400 × 0.5 d = 1 100 head-days
    expect(res.body.headDays).toBe(1100);
    expect(res.body.byDay.map((d: { date: string }) => d.date)).toEqual(['2027-01-10', '2027-01-11', '2027-01-12']);
    expect(res.body.byDay.reduce((s: number, d: { headDays: number }) => s + d.headDays, 0)).toBeCloseTo(1100, 9);
  });

  it('When a move would take the count below zero or moves are out of order, then 400 names the move', async () => {
    const below = await post('head-days', {
      moves: [
        { at: '2027-01-10T08:00:00Z', change: 100 },
        { at: '2027-01-11T08:00:00Z', change: -150 },
      ],
      until: '2027-01-12T08:00:00Z',
    });
    expect(below.status).toBe(400);
    expect(Object.keys(below.body.error.fields)).toEqual(['moves[1].change']);
    const order = await post('head-days', {
      moves: [
        { at: '2027-01-11T08:00:00Z', change: 100 },
        { at: '2027-01-10T08:00:00Z', change: -50 },
      ],
      until: '2027-01-12T08:00:00Z',
    });
    expect(order.status).toBe(400);
    expect(Object.keys(order.body.error.fields)[0]).toMatch(/^moves\[1\]/);
  });
});

describe('POST /api/calc/charge', () => {
  it('When 1 234.5 head-days are charged at $0.1875 with a $40 haul fee, then lines round half-up to the cent and add to the total', async () => {
    const res = await post('charge', { basis: 'head-day', quantity: 1234.5, rate: '0.1875', feesCents: [{ label: 'Trucking', amountCents: 4000 }] });
    expect(res.status).toBe(200);
    // 1 234.5 × 18.75 ¢ = 23 146.875 ¢ → 23 147 ¢
    expect(res.body.subtotalCents).toBe(23147);
    expect(res.body.totalCents).toBe(27147);
    expect(res.body.lines.reduce((s: number, l: { amountCents: number }) => s + l.amountCents, 0)).toBe(res.body.totalCents);
  });

  it('When the basis is unknown and the rate is not a decimal string, then 400 names both', async () => {
    const res = await post('charge', { basis: 'per-sheep', quantity: 10, rate: 0.2 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['basis', 'rate']);
  });
});

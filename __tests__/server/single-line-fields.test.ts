import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { blockBody, market } from '../helpers/market';

// Names people type end up in mail subjects and log lines. A CR LF in one could start a forged header
// ("Bcc: …") or a forged log line, so the API refuses control characters in single-line fields at input.

const INJECTED = 'Ana Field\r\nBcc: x@y.example';
const ONE_LINE = /must be on one line, without line breaks, tabs or other control characters/;

let t: Awaited<ReturnType<typeof makeTestApp>>;
let m: ReturnType<typeof market>;
beforeEach(async () => {
  t = await makeTestApp();
  m = market(t);
});
afterEach(() => t.close());

describe('POST /api/auth/register', () => {
  it('When the name carries "\\r\\nBcc: x@y", then 400 names the name field and no account is made', async () => {
    const res = await request(t.app).post('/api/auth/register').send({ email: 'ana@test.example', password: 'a-good-password', name: INJECTED, roles: ['grower'] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    expect(Object.keys(res.body.error.fields)).toEqual(['name']);
    expect(res.body.error.fields.name).toMatch(ONE_LINE);
    const login = await request(t.app).post('/api/auth/login').send({ email: 'ana@test.example', password: 'a-good-password' });
    expect(login.status).toBe(401);
  });
});

describe('PATCH /api/me', () => {
  it('When the business name or home base holds a line break, then 400 names each and the profile is unchanged', async () => {
    const p = await t.signUp(['grazier']);
    const res = await request(t.app).patch('/api/me').set(p.auth).send({ businessName: 'Haas Brush Goats\nBcc: x@y.example', homePlace: 'Pine Hollow\u2028corrals' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['businessName', 'homePlace']);
    const me = await request(t.app).get('/api/me').set(p.auth);
    expect(me.body.user.businessName).toBeNull();
  });
});

describe('POST /api/blocks and PATCH /api/blocks/:id', () => {
  it('When the block name carries "\\r\\nBcc: x@y", then 400 names the name field and nothing is stored', async () => {
    const g = await m.grower();
    const res = await m.api().post('/api/blocks').set(g.auth).send(blockBody({ name: 'North bench\r\nBcc: x@y.example' }));
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['name']);
    expect(res.body.error.fields.name).toMatch(ONE_LINE);
    expect((await m.api().get('/api/blocks').set(g.auth)).body.total).toBe(0);
  });

  it('When an edit puts a tab in a spray product, then 400 names that record field; notes keep their line breaks', async () => {
    const g = await m.grower();
    const b = await m.draft(g, { notes: 'Gate code at the office.\nCall first.' });
    expect(b.notes).toBe('Gate code at the office.\nCall first.');
    const res = await m
      .api()
      .patch(`/api/blocks/${b.id}`)
      .set(g.auth)
      .send({ sprayRecords: [{ product: 'Copper\thydroxide', appliedOn: '2026-11-01', grazingRestrictionDays: 14, containsCopper: true }] });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['sprayRecords[0].product']);
  });

  it('When notes hold a CR LF (not a bare LF), then 400 names notes', async () => {
    const g = await m.grower();
    const res = await m.api().post('/api/blocks').set(g.auth).send(blockBody({ notes: 'Gate code\r\nat the office' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ notes: 'Notes may hold line breaks, but no tabs or other control characters' });
  });
});

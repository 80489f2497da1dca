import crypto from 'node:crypto';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { contracts } from '../helpers/contracts';
import { Account } from '../../server/modules/accounts/account.entity';
import { Document } from '../../server/modules/documents/document.entity';
import { pdfkitRenderer } from '../../server/lib/pdf/pdfkit-renderer';
import type { PdfRenderer } from '../../server/lib/pdf/pdf-renderer';
import { headDaysFromMoves } from '../../lib/grazing/head-days';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let c: ReturnType<typeof contracts>;
beforeEach(async () => {
  t = await makeTestApp();
  c = contracts(t);
});
afterEach(() => t.close());

describe('POST /api/contracts/:id/sign-off', () => {
  it('When the grazier proposes and the grower approves, then the head-days from the log are agreed and locked with both names, and the log closes', async () => {
    const a = await c.grazed();
    const proposed = await c.signOff(a.grazier, a.contractId, { action: 'propose', comment: 'Out a day early, the cover was down' });
    expect(proposed.status).toBe(200);
    const expected = headDaysFromMoves({
      moves: [
        { at: '2027-01-10T08:00:00-08:00', change: 600 },
        { at: '2027-01-20T08:00:00-08:00', change: -600 },
      ],
      until: '2027-01-20T08:00:00-08:00',
      timeZone: 'America/Los_Angeles',
    });
    expect(proposed.body.contract.status).toBe('sign-off');
    expect(proposed.body.contract.signOff).toMatchObject({ round: 1, status: 'proposed', proposedHeadDays: 6000, byDay: expected.byDay, grazierName: 'Wade Kellner' });
    expect(proposed.body.contract.signOff.byDay[0]).toEqual({ date: '2027-01-10', headDays: 400 });

    // Only the grower answers; a stranger does not see the contract at all.
    expect((await c.signOff(a.grazier, a.contractId, { action: 'approve' })).status).toBe(403);
    const stranger = await c.grower('Sam Stranger');
    expect((await c.signOff(stranger, a.contractId, { action: 'approve' })).status).toBe(404);

    const approved = await c.signOff(a.grower, a.contractId, { action: 'approve' });
    expect(approved.status).toBe(200);
    expect(approved.body.contract).toMatchObject({ status: 'agreed', agreedHeadDays: 6000, signOff: { status: 'agreed', agreedBy: 'grower', growerName: 'Greta Olsen', grazierName: 'Wade Kellner' } });
    expect(approved.body.contract.signOff.agreedAt).toBe(new Date(Date.parse('2027-01-20T16:00:00-08:00')).toISOString());

    const twice = await c.signOff(a.grower, a.contractId, { action: 'approve' });
    expect(twice.status).toBe(409);
    const racing = await Promise.all([c.signOff(a.grower, a.contractId, { action: 'approve' }), c.signOff(a.grower, a.contractId, { action: 'dispute', headDays: 5000, comment: 'Late' })]);
    expect(racing.map((r) => r.status)).toEqual([409, 409]);

    const closed = await c.log(a.grazier, a.contractId, { kind: 'observation', at: '2027-01-20T10:00:00-08:00', note: 'One more' });
    expect(closed.status).toBe(409);
    expect(closed.body.error.code).toBe('log_closed');

    await t.deliverMail();
    expect(t.mail.to(a.grower.email).map((m) => m.subject)).toContain('Head-days to sign off: North bench walnut middles');
    const toGrower = t.mail.to(a.grower.email).find((m) => m.subject.startsWith('Head-days to sign off'))!;
    expect(toGrower.text).toContain(`http://fieldfold.test/contracts/${a.contractId}/log`);
    expect(toGrower.text).toContain('Out a day early, the cover was down');
    expect(t.mail.to(a.grazier.email).map((m) => m.subject)).toContain('Head-days agreed: North bench walnut middles');
  });

  it('When the grower disputes, then a comment and a counter are required; the grazier may accept the counter, which is then agreed', async () => {
    const a = await c.grazed();
    await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    const bare = await c.signOff(a.grower, a.contractId, { action: 'dispute' });
    expect(bare.status).toBe(400);
    expect(Object.keys(bare.body.error.fields).sort()).toEqual(['comment', 'headDays']);
    const fine = await c.signOff(a.grower, a.contractId, { action: 'dispute', headDays: 5400.12345, comment: 'Too precise' });
    expect(fine.status).toBe(400);
    expect(fine.body.error.fields.headDays).toMatch(/4 decimals/);

    const disputed = await c.signOff(a.grower, a.contractId, { action: 'dispute', headDays: 5400, comment: 'The flock left the north cell on the 19th' });
    expect(disputed.body.contract.signOff).toMatchObject({ status: 'disputed', counterHeadDays: 5400, disputeComment: 'The flock left the north cell on the 19th', growerName: 'Greta Olsen' });
    expect(disputed.body.contract.status).toBe('sign-off');
    expect((await c.signOff(a.grower, a.contractId, { action: 'accept-counter' })).status).toBe(403);

    const accepted = await c.signOff(a.grazier, a.contractId, { action: 'accept-counter' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.contract).toMatchObject({ status: 'agreed', agreedHeadDays: 5400, signOff: { status: 'agreed', agreedBy: 'grazier' } });
    expect((await c.signOff(a.grazier, a.contractId, { action: 'accept-counter' })).status).toBe(409);

    await t.deliverMail();
    expect(t.mail.to(a.grazier.email).map((m) => m.subject)).toContain('Head-days disputed: North bench walnut middles');
    expect(t.mail.to(a.grower.email).map((m) => m.subject)).toContain('Counter accepted — head-days agreed: North bench walnut middles');
  });

  it('When the grazier corrects the log after a dispute, then they propose again and the first round is kept as history', async () => {
    const a = await c.grazed();
    await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    // While the grower weighs the proposal, moves wait.
    const waiting = await c.log(a.grazier, a.contractId, { kind: 'move', at: '2027-01-20T09:00:00-08:00', change: 10 });
    expect(waiting.status).toBe(409);
    expect(waiting.body.error.code).toBe('sign_off_pending');
    await c.signOff(a.grower, a.contractId, { action: 'dispute', headDays: 5700, comment: '50 head went out on the 15th' });
    // The grazier corrects the log: the last move out was 550, after 50 culls left on the 15th.
    const page = await c.api().get(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth);
    const lastOut = page.body.items.find((e: { change: number }) => e.change === -600);
    expect((await c.api().post(`/api/contracts/${a.contractId}/log/${lastOut.id}/void`).set(a.grower.auth).send({ reason: 'Not mine' })).status).toBe(403);
    const voided = await c.api().post(`/api/contracts/${a.contractId}/log/${lastOut.id}/void`).set(a.grazier.auth).send({ reason: 'Only 550 left on the 20th' });
    expect(voided.status).toBe(200);
    expect(voided.body.entry.voided).toMatchObject({ reason: 'Only 550 left on the 20th' });
    expect(voided.body.figures.headNow).toBe(600);
    await c.logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-15T08:00:00-08:00', change: -50, note: '50 culls went to the sale yard' });
    await c.logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-20T08:00:00-08:00', change: -550 });
    const again = await c.signOff(a.grazier, a.contractId, { action: 'propose', comment: 'Corrected' });
    expect(again.status).toBe(200);
    // 600 × 5 days + 550 × 5 days.
    expect(again.body.contract.signOff).toMatchObject({ round: 2, status: 'proposed', proposedHeadDays: 5750 });
    expect(again.body.contract.signOffHistory.map((r: { status: string }) => r.status)).toEqual(['superseded', 'proposed']);
    expect((await c.signOff(a.grower, a.contractId, { action: 'approve' })).body.contract.agreedHeadDays).toBe(5750);
  });

  it('When animals are still on the block, the grazing has not begun, or a figure is sent with the proposal, then 409, 409 and 400', async () => {
    const a = await c.signed();
    const notYet = await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    expect(notYet.status).toBe(409);
    expect(notYet.body.error.code).toBe('not_grazing');
    t.setNow('2027-01-12T08:00:00-08:00');
    await c.logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-10T08:00:00-08:00', change: 600 });
    const on = await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    expect(on.status).toBe(409);
    expect(on.body.error.code).toBe('animals_on_block');
    const own = await c.signOff(a.grazier, a.contractId, { action: 'propose', headDays: 9999 });
    expect(own.status).toBe(400);
    expect(own.body.error.fields).toHaveProperty('headDays');
    expect((await c.signOff(a.grower, a.contractId, { action: 'approve' })).status).toBe(409);
  });

  it('When an amendment corrects the agreed head-days, then the agreed figure changes only once both have signed it', async () => {
    const a = await c.grazed();
    await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    await c.signOff(a.grower, a.contractId, { action: 'approve' });
    const res = await c.api().post(`/api/contracts/${a.contractId}/amendments`).set(a.grower.auth).send({ agreedHeadDays: 5950, reason: 'Ten ewes were the neighbour’s, off the count' });
    expect(res.status).toBe(201);
    expect(res.body.amendment.changes).toEqual([{ field: 'agreedHeadDays', label: 'Agreed head-days', from: '6,000', to: '5,950' }]);
    await c.sign(a.grower, a.contractId);
    expect((await c.read(a.grower, a.contractId)).agreedHeadDays).toBe(6000);
    const done = await c.sign(a.grazier, a.contractId);
    expect(done.body.contract).toMatchObject({ status: 'agreed', agreedHeadDays: 5950, termsVersion: 2 });
  });
});

/** The real pdfkit renderer, counting what it renders (and failing while `failing` is set). */
function countingPdf() {
  const real = pdfkitRenderer();
  const state = { renders: 0, failing: false };
  const renderer: PdfRenderer = {
    async renderGrazingLog(data) {
      if (state.failing) throw new Error('fonts missing');
      state.renders += 1;
      return real.renderGrazingLog(data);
    },
    renderInvoice: (data) => real.renderInvoice(data),
  };
  return { renderer, state };
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-log-pdf-'));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** The PDF's text as a reader's viewer shows it (Debian's poppler-utils), whitespace collapsed. */
function pdfText(bytes: Buffer): string {
  expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
  const file = path.join(dir, `${crypto.randomUUID()}.pdf`);
  fs.writeFileSync(file, bytes);
  return execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

describe('GET /api/contracts/:id/log.pdf', () => {
  const getPdf = (who: { auth: Record<string, string> }, id: string) =>
    request(t.app)
      .get(`/api/contracts/${id}/log.pdf`)
      .set(who.auth)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (d: Buffer) => chunks.push(d));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
  const stored = (contractId: string) => t.dataSource.getRepository(Document).find({ where: { contractId, kind: 'grazing-log' }, order: { version: 'ASC' } });

  it('When the head-days are agreed, then the record is rendered after the commit and stored; both parties and the operator get the stored file, a stranger 404', async () => {
    await t.close();
    const pdf = countingPdf();
    t = await makeTestApp({ pdf: pdf.renderer });
    c = contracts(t);
    const a = await c.grazed();
    // A log still being kept: a draft made on request, not stored.
    const draft = await getPdf(a.grower, a.contractId);
    expect(draft.status).toBe(200);
    expect(draft.headers['content-type']).toBe('application/pdf');
    expect(draft.headers['content-disposition']).toMatch(/-draft\.pdf"$/);
    expect(pdfText(draft.body)).toContain('Head-days not agreed yet');
    expect(await stored(a.contractId)).toHaveLength(0);

    await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    await c.signOff(a.grower, a.contractId, { action: 'approve' });
    expect(await stored(a.contractId)).toHaveLength(1);
    const rendersSoFar = pdf.state.renders;

    const got = await getPdf(a.grazier, a.contractId);
    expect(got.status).toBe(200);
    expect(got.headers['x-document-version']).toBe('1');
    expect(got.headers['content-disposition']).toMatch(/fieldfold-grazing-log-.*-v1\.pdf"$/);
    // Served from the store: nothing rendered on the read, and the bytes are the stored file's.
    expect(pdf.state.renders).toBe(rendersSoFar);
    expect(crypto.createHash('sha256').update(got.body).digest('hex')).toBe((await stored(a.contractId))[0].sha256);
    const contract = await c.read(a.grower, a.contractId);
    const text = pdfText(got.body);
    for (const words of [contract.termsHash, 'Greta Olsen', 'Wade Kellner', 'North bench walnut middles', 'Head-days agreed at sign-off: 6,000']) expect(text).toContain(words);

    const ops = await c.grower('Fieldfold Operator');
    await t.dataSource.getRepository(Account).update({ id: ops.user.id }, { roles: 'admin' });
    expect((await getPdf(ops, a.contractId)).status).toBe(200);
    const stranger = await c.grazier('Stella Stranger');
    expect((await getPdf(stranger, a.contractId)).status).toBe(404);
    expect((await request(t.app).get(`/api/contracts/${a.contractId}`).set(stranger.auth)).status).toBe(404);

    // An amendment both sign makes a new version.
    await c.api().post(`/api/contracts/${a.contractId}/amendments`).set(a.grower.auth).send({ agreedHeadDays: 5950, reason: 'Ten ewes off the count' });
    await c.sign(a.grower, a.contractId);
    await c.sign(a.grazier, a.contractId);
    expect((await stored(a.contractId)).map((d) => d.version)).toEqual([1, 2]);
    const v2 = await getPdf(a.grower, a.contractId);
    expect(v2.headers['x-document-version']).toBe('2');
    const text2 = pdfText(v2.body);
    expect(text2).toContain('Head-days agreed at sign-off: 5,950');
    expect(text2).toContain((await c.read(a.grower, a.contractId)).termsHash);
  });

  it('When the render after the commit fails, then the agreement stands and the first request makes and stores the file', async () => {
    await t.close();
    const pdf = countingPdf();
    const logged: string[] = [];
    t = await makeTestApp({ log: (l) => logged.push(l), pdf: pdf.renderer });
    c = contracts(t);
    const a = await c.grazed();
    await c.signOff(a.grazier, a.contractId, { action: 'propose' });
    pdf.state.failing = true;
    const approved = await c.signOff(a.grower, a.contractId, { action: 'approve' });
    expect(approved.body.contract.status).toBe('agreed');
    expect(logged.some((l) => /\[pdf\] grazing log of contract .* not stored: fonts missing/.test(l))).toBe(true);
    expect(await stored(a.contractId)).toHaveLength(0);
    pdf.state.failing = false;
    const got = await getPdf(a.grower, a.contractId);
    expect(got.status).toBe(200);
    expect(got.headers['x-document-version']).toBe('1');
    expect(await stored(a.contractId)).toHaveLength(1);
    // The second read is served from the store.
    const renders = pdf.state.renders;
    expect((await getPdf(a.grazier, a.contractId)).headers['x-document-version']).toBe('1');
    expect(pdf.state.renders).toBe(renders);
  });
});

import { makeTestApp } from '../helpers/test-app';
import { contracts } from '../helpers/contracts';
import { canonicalTermsText } from '../../lib/contract-terms';
import { sha256Hex } from '../../server/modules/contracts/contract-state';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { ContractSignature } from '../../server/modules/contracts/contract-records.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let c: ReturnType<typeof contracts>;
beforeEach(async () => {
  t = await makeTestApp();
  c = contracts(t);
});
afterEach(() => t.close());

describe('POST /api/contracts/:id/sign', () => {
  it('When both parties sign, then the contract is signed, each signature keeps who, when, where from and the hash of the text they read', async () => {
    const a = await c.awarded();
    const before = await c.read(a.grower, a.contractId);
    expect(before).toMatchObject({ status: 'to-sign', termsVersion: 1, signatures: [], viewer: { party: 'grower', mustSign: true } });
    // The hash is SHA-256 of the canonical text shown on the screen.
    expect(before.termsHash).toBe(sha256Hex(before.termsText));
    expect(before.termsText).toContain('Animals out by: 2027-03-01 (Mar 1, 2027)');
    expect(before.cautions.map((x: { key: string }) => x.key)).toContain('food-safety-harvest');

    const g = await c.sign(a.grower, a.contractId);
    expect(g.status).toBe(200);
    expect(g.body.contract.status).toBe('to-sign');
    expect(g.body.contract.viewer.mustSign).toBe(false);
    const z = await c.sign(a.grazier, a.contractId);
    expect(z.status).toBe(200);
    expect(z.body.contract.status).toBe('signed');
    expect(z.body.contract.signatures.map((s: { party: string }) => s.party).sort()).toEqual(['grazier', 'grower']);

    const rows = await t.dataSource.getRepository(ContractSignature).findBy({ contractId: a.contractId });
    expect(rows).toHaveLength(2);
    for (const r of rows) {
      expect(r.termsHash).toBe(before.termsHash);
      expect(r.userAgent).toBe('fieldfold-tests/1.0');
      expect(r.ip).toMatch(/127\.0\.0\.1|::1|::ffff:127\.0\.0\.1/);
      expect(r.cautionsAcknowledged).toBe(true);
    }
    const stored = await t.dataSource.getRepository(Contract).findOneByOrFail({ id: a.contractId });
    expect(stored.termsHash).toBe(sha256Hex(canonicalTermsText(stored.terms!)));

    await t.deliverMail();
    expect(t.mail.to(a.grazier.email).map((m) => m.subject)).toContain('Greta Olsen signed the contract for North bench walnut middles');
    expect(t.mail.to(a.grower.email).map((m) => m.subject)).toContain('Contract signed by both: North bench walnut middles');
  });

  it('When a party signs twice, then 409; and two signatures racing give one', async () => {
    const a = await c.awarded();
    expect((await c.sign(a.grower, a.contractId)).status).toBe(200);
    const again = await c.sign(a.grower, a.contractId);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_signed');

    const [x, y] = await Promise.all([c.sign(a.grazier, a.contractId), c.sign(a.grazier, a.contractId)]);
    expect([x.status, y.status].sort()).toEqual([200, 409]);
    expect(await t.dataSource.getRepository(ContractSignature).countBy({ contractId: a.contractId })).toBe(2);
  });
});

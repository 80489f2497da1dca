import crypto from 'node:crypto';
import sharp from 'sharp';
import { makeInvoicingApp } from './invoicing';
import { market, type Person } from './market';
import { TEST_NOW } from './test-app';
import { Account } from '../../server/modules/accounts/account.entity';
import { Contract } from '../../server/modules/contracts/contract.entity';

// One world for the trust tests (authorisation matrix, hostile input): a grower who owns the blocks, another
// grower, the grazier who is party to the contracts, a rival grazier who bid on the same blocks and lost, and the
// operator (admin, granted as scripts/make-admin.ts grants it). Records in each state a route acts on are made
// through the API, so every fixture is something the API itself would have produced.

export const ACTORS = ['out', 'owner', 'grower', 'party', 'rival', 'admin'] as const;
/** out: signed out · owner: the grower who owns the block · grower: another grower · party: the grazier on the contract · rival: another grazier who also bid · admin: the operator. */
export type Actor = (typeof ACTORS)[number];

/** The clock while the log is kept: the stay runs Jan 10–28, 2027 at the block (America/Los_Angeles). */
export const LOG_NOW = '2027-01-20T16:00:00-08:00';
export const MOVE_IN_AT = '2027-01-10T08:00:00-08:00';
export const MOVE_OUT_AT = '2027-01-20T08:00:00-08:00';

export const PASSWORD = 'long-enough-password';

/** A real 8×8 PNG (an upload may be decoded and re-encoded, so a bare signature is not enough). */
export async function tinyPng(): Promise<Buffer> {
  return sharp({ create: { width: 8, height: 8, channels: 3, background: { r: 106, g: 140, b: 64 } } }).png().toBuffer();
}

export async function trustWorld() {
  const t = await makeInvoicingApp();
  const m = market(t);
  const api = t.api;
  const png = await tinyPng();

  const owner = await m.grower('Greta Olsen');
  const grower = await m.grower('Hal Brandt');
  const party = await m.grazier('Wade Kellner');
  const rival = await m.grazier('Rita Marsh');
  const admin = await t.signUp(['grower'], 'Opal Operator');
  await t.dataSource.getRepository(Account).update({ id: admin.user.id }, { roles: 'admin', activeRole: null });
  const people: Record<Exclude<Actor, 'out'>, Person> = { owner, grower, party, rival, admin };

  function person(actor: Exclude<Actor, 'out'>): Person {
    return people[actor];
  }
  function auth(actor: Actor): Record<string, string> {
    return actor === 'out' ? {} : people[actor].auth;
  }

  function ok<T>(res: { status: number; body: unknown }, want: number, what: string): T {
    if (res.status !== want) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body as T;
  }

  const draftBlock = async () => (await m.draft(owner)).id;
  const openBlock = async () => (await m.openBlock(owner)).id;

  async function photo(blockId: string): Promise<{ id: string; url: string }> {
    const res = await api().post(`/api/blocks/${blockId}/photos`).set(owner.auth).attach('photo', png, { filename: 'block.png', contentType: 'image/png' });
    return ok<{ photo: { id: string; url: string } }>(res, 201, 'photo').photo;
  }

  /** The rival bids first, then the party: both live on the block. */
  async function bids(blockId: string) {
    const rivalBidId = (await m.bid(rival, blockId, { headCount: 500 })).id;
    const partyBidId = (await m.bid(party, blockId)).id;
    return { rivalBidId, partyBidId };
  }

  /** An open block with both bids, the party's awarded: a contract to sign. */
  async function toSign() {
    const blockId = await openBlock();
    const b = await bids(blockId);
    const contractId = ok<{ contract: { id: string } }>(await api().post(`/api/bids/${b.partyBidId}/award`).set(owner.auth), 201, 'award').contract.id;
    return { blockId, contractId, ...b };
  }

  async function termsHash(contractId: string): Promise<string> {
    const c = ok<{ contract: { termsHash: string; pendingAmendment: { termsHash: string } | null } }>(await api().get(`/api/contracts/${contractId}`).set(owner.auth), 200, 'read').contract;
    return c.pendingAmendment?.termsHash ?? c.termsHash;
  }

  async function signBody(who: Person, contractId: string) {
    return { typedName: who.user.name, cautionsAcknowledged: true, termsHash: await termsHash(contractId) };
  }

  async function signed() {
    const c = await toSign();
    for (const who of [owner, party]) ok(await api().post(`/api/contracts/${c.contractId}/sign`).set(who.auth).send(await signBody(who, c.contractId)), 200, 'sign');
    return c;
  }

  function logEntry(who: Person, contractId: string, entry: Record<string, unknown>) {
    return api().post(`/api/contracts/${contractId}/log`).set(who.auth).send({ clientId: crypto.randomUUID(), ...entry });
  }

  /** Signed, and 600 head in on Jan 10 (the clock moves to LOG_NOW and stays there). */
  async function grazing() {
    const c = await signed();
    t.setNow(LOG_NOW);
    ok(await logEntry(party, c.contractId, { kind: 'move', at: MOVE_IN_AT, change: 600, paddock: 'North cell' }), 201, 'move in');
    return c;
  }

  /** Grazing, and all 600 out on Jan 20: ready for the grazier to propose the head-days. */
  async function grazed() {
    const c = await grazing();
    ok(await logEntry(party, c.contractId, { kind: 'move', at: MOVE_OUT_AT, change: -600 }), 201, 'move out');
    return c;
  }

  async function proposed() {
    const c = await grazed();
    ok(await api().post(`/api/contracts/${c.contractId}/sign-off`).set(party.auth).send({ action: 'propose' }), 200, 'propose');
    return c;
  }

  /** An observation by `who` on a contract whose log is open (clock at LOG_NOW). */
  async function observation(contractId: string, who: Person = party): Promise<string> {
    return ok<{ entry: { id: string } }>(await logEntry(who, contractId, { kind: 'observation', at: '2027-01-15T09:00:00-08:00', note: 'Water trough full' }), 201, 'observation').entry.id;
  }

  async function logPhoto(contractId: string, entryId: string): Promise<{ id: string; url: string }> {
    const res = await api().post(`/api/contracts/${contractId}/log/${entryId}/photos`).set(party.auth).attach('photo', png, { filename: 'trough.png', contentType: 'image/png' });
    return ok<{ photo: { id: string; url: string } }>(res, 201, 'log photo').photo;
  }

  /** The owner proposes 500 head instead of 600 on a contract still to sign. */
  async function withAmendment() {
    const c = await toSign();
    const body = ok<{ amendment: { id: string } }>(await api().post(`/api/contracts/${c.contractId}/amendments`).set(owner.auth).send({ headCount: 500, reason: 'Less feed after the frost' }), 201, 'amend');
    return { ...c, amendmentId: body.amendment.id };
  }

  /** A contract whose head-days are agreed (set in the store, as helpers/invoicing.ts does: sign-off is another module's). */
  async function agreed() {
    const c = await toSign();
    await t.dataSource.getRepository(Contract).update({ id: c.contractId }, { status: 'agreed', agreedHeadDays: 10_800 });
    return c;
  }

  /** An agreed contract invoiced by the party, sent through the payments fake. */
  async function sentInvoice() {
    const c = await agreed();
    const invoice = ok<{ invoice: { id: string; status: string; pdf: { url: string } } }>(await api().post(`/api/contracts/${c.contractId}/invoice`).set(party.auth).send({}), 201, 'invoice').invoice;
    if (invoice.status !== 'sent') throw new Error(`invoice is ${invoice.status}, not sent`);
    return { ...c, invoiceId: invoice.id, pdfUrl: invoice.pdf.url };
  }

  return {
    t,
    api,
    png,
    people,
    person,
    auth,
    resetClock: () => t.setNow(new Date(TEST_NOW).toISOString()),
    draftBlock,
    openBlock,
    photo,
    bids,
    toSign,
    signBody,
    signed,
    grazing,
    grazed,
    proposed,
    observation,
    logPhoto,
    withAmendment,
    agreed,
    sentInvoice,
  };
}

export type TrustWorld = Awaited<ReturnType<typeof trustWorld>>;

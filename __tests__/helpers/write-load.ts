import type { DataSource } from 'typeorm';
import sharp from 'sharp';
import { Account } from '../../server/modules/accounts/account.entity';
import { Block } from '../../server/modules/blocks/block.entity';
import { BlockPhoto } from '../../server/modules/blocks/block-photo.entity';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { LogEntry } from '../../server/modules/contracts/contract-records.entity';
import { blockBody } from './market';
import { bid, blockDates, grazier, logEntry, logTimes, openBlock, signUp, type Live, type LivePerson } from './live-flow';

// Writes through the API from several workers at once until stopped — or until the server stops answering —
// keeping every record whose request got a 2xx answer, and when that answer arrived. The restart test kills
// the server under this load; the backup test takes a backup under it. Then each checks the records it must
// find: every one answered before the kill, or before the backup began.

export interface Committed<T> {
  value: T;
  /** Epoch ms the 2xx answer arrived (the transaction had committed by then). */
  answeredAt: number;
}

export interface WriteLoad {
  /** Log entries (by client id) on the contract the load writes to. */
  entries: Array<Committed<string>>;
  /** Draft blocks created. */
  blocks: Array<Committed<string>>;
  /** Accounts signed up (email). */
  accounts: Array<Committed<string>>;
  /** Awards: the block and the contract it made. */
  awards: Array<Committed<{ blockId: string; contractId: string }>>;
  /** Block photos stored (photo id; its file is in DATA_DIR/uploads). */
  photos: Array<Committed<{ blockId: string; photoId: string }>>;
  /** How many 2xx answers so far. */
  count(): number;
  /** Answers that were neither 2xx nor a lost connection (they fail the test). */
  unexpected: string[];
  /** Stops the workers after their current request; resolves once all have stopped. */
  stop(): Promise<void>;
}

/** A small real PNG (the upload path may re-encode images, so it must decode). */
export async function testPng(seed: number): Promise<Buffer> {
  return sharp({ create: { width: 16, height: 12, channels: 3, background: { r: seed % 256, g: 120, b: 60 } } })
    .png()
    .toBuffer();
}

function lostConnection(err: unknown): boolean {
  const code = (err as NodeJS.ErrnoException)?.code;
  return code === 'ECONNREFUSED' || code === 'ECONNRESET' || code === 'EPIPE' || code === 'ETIMEDOUT' || /socket hang up|ECONNRESET|ECONNREFUSED/.test(String(err));
}

/**
 * Starts the workers on a signed contract (the grazier logs tallies after a move in) and a grower who posts
 * blocks, uploads photos and awards. `live.api()` must reach the server under test.
 */
export async function startWriteLoad(live: Live, on: { grower: LivePerson; grazier: LivePerson; contractId: string }): Promise<WriteLoad> {
  let running = true;
  const load: Omit<WriteLoad, 'count' | 'stop'> = { entries: [], blocks: [], accounts: [], awards: [], photos: [], unexpected: [] };
  const [inAt] = logTimes(live.now(), 1);
  const first = await live.api().post(`/api/contracts/${on.contractId}/log`).set(on.grazier.auth).send(logEntry('move', inAt, { change: 600 }));
  if (first.status !== 201) throw new Error(`move in: ${first.status} ${JSON.stringify(first.body)}`);
  load.entries.push({ value: first.body.entry.clientId, answeredAt: Date.now() });

  /** Runs `step` until stopped or the server goes away; any other failure is kept in `unexpected`. */
  async function worker(name: string, step: (n: number) => Promise<void>) {
    for (let n = 0; running; n++) {
      try {
        await step(n);
      } catch (err) {
        if (lostConnection(err)) return;
        load.unexpected.push(`${name}: ${err instanceof Error ? err.message : String(err)}`);
        return;
      }
    }
  }
  const expect2xx = (what: string, res: { status: number; body: unknown }) => {
    if (res.status < 200 || res.status > 299) throw new Error(`${what} answered ${res.status} ${JSON.stringify(res.body)}`);
  };

  const workers = [
    worker('log', async () => {
      const entry = logEntry('tally', new Date(live.now() - 1000).toISOString(), { count: 600, note: 'checked the water trough' });
      const res = await live.api().post(`/api/contracts/${on.contractId}/log`).set(on.grazier.auth).send(entry);
      expect2xx('log entry', res);
      load.entries.push({ value: entry.clientId, answeredAt: Date.now() });
    }),
    worker('log-2', async () => {
      const entry = logEntry('observation', new Date(live.now() - 1000).toISOString(), { residualHeightIn: 4, note: 'even grazing in the middles' });
      const res = await live.api().post(`/api/contracts/${on.contractId}/log`).set(on.grazier.auth).send(entry);
      expect2xx('log entry', res);
      load.entries.push({ value: entry.clientId, answeredAt: Date.now() });
    }),
    worker('blocks', async (n) => {
      const res = await live.api().post('/api/blocks').set(on.grower.auth).send(blockBody({ ...blockDates(live.now()), name: `Draft middles ${n}` }));
      expect2xx('block', res);
      load.blocks.push({ value: res.body.block.id, answeredAt: Date.now() });
      if (n % 3 === 0) {
        const photo = await live.api().post(`/api/blocks/${res.body.block.id}/photos`).set(on.grower.auth).attach('photo', await testPng(n), { filename: `row-${n}.png`, contentType: 'image/png' });
        expect2xx('photo', photo);
        load.photos.push({ value: { blockId: res.body.block.id, photoId: photo.body.photo.id }, answeredAt: Date.now() });
      }
    }),
    worker('accounts', async () => {
      const p = await signUp(live, ['grazier'], 'Load Grazier');
      load.accounts.push({ value: p.email, answeredAt: Date.now() });
    }),
    worker('awards', async (n) => {
      const block = await openBlock(live, on.grower, { name: `Awarded middles ${n}` });
      const g = await grazier(live, `Bidder ${n}`);
      const b = await bid(live, g, block.id);
      const res = await live.api().post(`/api/bids/${b.id}/award`).set(on.grower.auth);
      expect2xx('award', res);
      load.awards.push({ value: { blockId: block.id, contractId: res.body.contract.id }, answeredAt: Date.now() });
    }),
  ];

  return {
    ...load,
    count: () => load.entries.length + load.blocks.length + load.accounts.length + load.awards.length + load.photos.length,
    stop: async () => {
      running = false;
      await Promise.all(workers);
    },
  };
}

/** What of `load` answered before `before` (epoch ms) is missing from the database. */
export async function missingFrom(db: DataSource, load: WriteLoad, contractId: string, before = Infinity): Promise<string[]> {
  const sure = <T>(xs: Array<Committed<T>>) => xs.filter((x) => x.answeredAt < before).map((x) => x.value);
  const missing: string[] = [];
  const entries = new Set((await db.getRepository(LogEntry).findBy({ contractId })).map((e) => e.clientId));
  for (const id of sure(load.entries)) if (!entries.has(id)) missing.push(`log entry ${id}`);
  for (const id of sure(load.blocks)) if (!(await db.getRepository(Block).existsBy({ id }))) missing.push(`block ${id}`);
  for (const email of sure(load.accounts)) if (!(await db.getRepository(Account).existsBy({ email }))) missing.push(`account ${email}`);
  for (const a of sure(load.awards)) {
    const c = await db.getRepository(Contract).findOneBy({ id: a.contractId });
    if (!c || c.blockId !== a.blockId) missing.push(`contract ${a.contractId}`);
  }
  for (const p of sure(load.photos)) if (!(await db.getRepository(BlockPhoto).existsBy({ id: p.photoId, blockId: p.blockId }))) missing.push(`photo ${p.photoId}`);
  return missing;
}

import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { createDataSource } from '../../server/db/data-source';
import { DATABASE_FILE } from '../../server/config/env';
import { BlockPhoto } from '../../server/modules/blocks/block-photo.entity';
import { LogEntry } from '../../server/modules/contracts/contract-records.entity';
import { logEntry, signed, type Live } from '../helpers/live-flow';
import { killStartedServers, startServerProcess, type ServerProcess } from '../helpers/server-process';
import { freshTestDatabase, onPostgres, type TestDatabase } from '../helpers/test-database';
import { missingFrom, startWriteLoad } from '../helpers/write-load';

// The real server (server/index.ts in its own process, SQLite in a temp DATA_DIR) is killed with SIGKILL while
// five workers write through its API — sign-ups, blocks, photos, bids and awards, log entries — and started again
// on the same DATA_DIR. Nothing that was answered 2xx may be lost: a 2xx is sent after the commit, and SQLite
// in WAL mode with synchronous = FULL keeps every commit through a crash. Requests in flight at the kill got no
// answer, so the test asks nothing of them.
// In npm test's PostgreSQL pass the server's database is a fresh one of the throw-away cluster (DATABASE_URL),
// which the kill does not touch: there the test holds the server to answering only after COMMIT, to starting
// again on that database right after the kill (its old sessions still being ended), and to the same recovery.

jest.setTimeout(180_000);

let dataDir: string;
let db: DataSource | null = null;
let database: TestDatabase | null = null;
afterEach(async () => {
  await db?.destroy();
  db = null;
  await killStartedServers();
  await database?.drop();
  database = null;
  fs.rmSync(dataDir, { recursive: true, force: true });
});

async function until(what: string, ok: () => boolean, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  while (!ok()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

test('When the server is killed mid-flow and started again on the same DATA_DIR, then every request answered 2xx is there and the database is sound', async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-restart-'));
  database = onPostgres ? await freshTestDatabase({ migrated: false }) : null;
  const env: Record<string, string> = database ? { DATABASE_URL: database.target } : {};
  let server: ServerProcess = await startServerProcess({ dataDir, env });
  const live: Live = { api: () => request(server.url), now: Date.now };
  const s = await signed(live);

  const load = await startWriteLoad(live, s);
  await until('writes under load', () => load.count() >= 60 || load.unexpected.length > 0);
  await server.kill();
  await load.stop();
  expect(load.unexpected).toEqual([]);
  // Every kind of write had been answered before the kill.
  expect([load.entries, load.blocks, load.accounts, load.awards, load.photos].map((xs) => xs.length > 0)).toEqual([true, true, true, true, true]);

  // The killed process left its registration behind; a dead process does not count, and the new one starts.
  expect(fs.readdirSync(path.join(dataDir, 'running'))).toEqual([`${server.pid}.json`]);
  server = await startServerProcess({ dataDir, env });
  db = createDataSource(database ? database.target : path.join(dataDir, DATABASE_FILE));
  await db.initialize();
  if (!onPostgres) expect(await db.query('PRAGMA integrity_check')).toEqual([{ integrity_check: 'ok' }]);
  expect(await missingFrom(db, load, s.contractId)).toEqual([]);
  for (const p of load.photos) {
    const row = await db.getRepository(BlockPhoto).findOneByOrFail({ id: p.value.photoId });
    expect(fs.existsSync(path.join(dataDir, 'uploads', row.fileName))).toBe(true);
  }

  // It carries on where it stopped: a phone replaying an entry the killed server stored gets that entry back
  // (stored once), and new writes are taken.
  const stored = await db.getRepository(LogEntry).findOneByOrFail({ clientId: load.entries[1].value });
  const replay = await live
    .api()
    .post(`/api/contracts/${s.contractId}/log`)
    .set(s.grazier.auth)
    .send({ clientId: stored.clientId, kind: stored.kind, at: stored.at, count: stored.count ?? undefined, note: stored.note ?? undefined, residualHeightIn: stored.residualHeightIn ?? undefined });
  expect(replay.status).toBe(200);
  expect(replay.body.entry.id).toBe(stored.id);
  expect(await db.getRepository(LogEntry).countBy({ clientId: stored.clientId })).toBe(1);
  const fresh = await live.api().post(`/api/contracts/${s.contractId}/log`).set(s.grazier.auth).send(logEntry('observation', new Date(Date.now() - 1000).toISOString(), { note: 'after the restart' }));
  expect(fresh.status).toBe(201);

  expect(await server.stop()).toBe(0);
  expect(fs.readdirSync(path.join(dataDir, 'running'))).toEqual([]);
});

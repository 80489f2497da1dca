import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { DATABASE_FILE } from '../../server/config/env';
import { BlockPhoto } from '../../server/modules/blocks/block-photo.entity';
import { Document } from '../../server/modules/documents/document.entity';
import { agreed, signed, type Live } from '../helpers/live-flow';
import { killStartedServers, ROOT, startServerProcess, type ServerProcess } from '../helpers/server-process';
import { missingFrom, startWriteLoad } from '../helpers/write-load';

// npm run backup under write load, and npm run restore, as an operator runs them: the commands in their own
// processes, the real server in its own, SQLite in a temp DATA_DIR. The backup must hold every record whose
// request was answered before the backup began, a sound database, and the stored files (photos and PDFs).

jest.setTimeout(240_000);

const dirs: string[] = [];
const opened: DataSource[] = [];
function tempDir(name: string): string {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), `fieldfold-${name}-`));
  dirs.push(d);
  return d;
}
afterEach(async () => {
  for (const ds of opened.splice(0)) await ds.destroy();
  await killStartedServers();
  for (const d of dirs.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

/** Runs an npm script without blocking this process (the write load goes on meanwhile). */
function npm(script: string, args: string[], env: Record<string, string>): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn('npm', ['run', '--silent', script, ...(args.length ? ['--', ...args] : [])], { cwd: ROOT, env: { ...process.env, ...env } });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d) => (stdout += d));
    child.stderr.on('data', (d) => (stderr += d));
    child.on('error', reject);
    child.on('exit', (code) => resolve({ code, stdout, stderr }));
  });
}

function lastLine(text: string): string {
  return text.trim().split('\n').at(-1)!.trim();
}

function sha256(file: string): string {
  return crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

async function open(dataDir: string): Promise<DataSource> {
  const ds = await openDatabase(path.join(dataDir, DATABASE_FILE));
  opened.push(ds);
  return ds;
}

async function until(what: string, ok: () => boolean, timeoutMs = 60_000) {
  const deadline = Date.now() + timeoutMs;
  while (!ok()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

test('When a backup is taken while the server keeps writing, then restored into a fresh DATA_DIR it holds every record committed before it began, a sound database and the files', async () => {
  const dataDir = tempDir('backup-live');
  const backupDir = tempDir('backup-to');
  let server: ServerProcess = await startServerProcess({ dataDir });
  const live: Live = { api: () => request(server.url), now: Date.now };
  // A contract agreed at sign-off has its grazing-log PDF stored under documents/.
  const done = await agreed(live);
  const s = await signed(live);
  const load = await startWriteLoad(live, s);
  await until('writes under load', () => load.count() >= 30 || load.unexpected.length > 0);

  const began = Date.now();
  const countAtStart = load.count();
  const backup = await npm('backup', [], { DATA_DIR: dataDir, BACKUP_DIR: backupDir });
  expect(backup.stderr).toBe('');
  expect(backup.code).toBe(0);
  // The writes went on while it ran (the backup never blocks the server).
  expect(load.count()).toBeGreaterThan(countAtStart);
  await load.stop();
  expect(load.unexpected).toEqual([]);
  expect(await server.stop()).toBe(0);

  // Its path is the last line; the folder holds the database, the files and the manifest.
  const where = lastLine(backup.stdout);
  expect(path.dirname(where)).toBe(backupDir);
  expect(path.basename(where)).toMatch(/^fieldfold-\d{4}-\d{2}-\d{2}T\d{2}-\d{2}-\d{2}-\d{3}Z$/);
  const manifest = JSON.parse(fs.readFileSync(path.join(where, 'manifest.json'), 'utf8'));
  expect(manifest.database).toMatchObject({ engine: 'sqlite', file: DATABASE_FILE, integrity: 'ok', sha256: sha256(path.join(where, DATABASE_FILE)) });
  expect(manifest.files.uploads.count).toBeGreaterThan(0);
  expect(manifest.files.documents.count).toBeGreaterThan(0);

  const target = tempDir('restored');
  const restored = await npm('restore', [where], { DATA_DIR: target });
  expect(restored.stderr).toBe('');
  expect(restored.code).toBe(0);

  const db = await open(target);
  expect(await db.query('PRAGMA integrity_check')).toEqual([{ integrity_check: 'ok' }]);
  expect(await missingFrom(db, load, s.contractId, began)).toEqual([]);
  // The manifest's counts are the restored database's.
  for (const [table, n] of Object.entries(manifest.database.tables as Record<string, number>)) {
    expect([table, (await db.query(`SELECT COUNT(*) AS n FROM "${table}"`))[0].n]).toEqual([table, n]);
  }
  // Every photo and document the copy names is there, byte for byte.
  const photos = await db.getRepository(BlockPhoto).find();
  expect(photos.length).toBeGreaterThan(0);
  for (const p of photos) expect(fs.existsSync(path.join(target, 'uploads', p.fileName))).toBe(true);
  const docs = await db.getRepository(Document).findBy({ contractId: done.contractId });
  expect(docs.length).toBeGreaterThan(0);
  for (const d of docs) expect(sha256(path.join(target, 'documents', ...d.storageKey.split('/')))).toBe(d.sha256);

  // A server on the restored data serves it.
  server = await startServerProcess({ dataDir: target });
  const contract = await request(server.url).get(`/api/contracts/${done.contractId}`).set(done.grower.auth);
  expect(contract.status).toBe(200);
  expect(contract.body.contract.status).toBe('agreed');
  expect(await server.stop()).toBe(0);
});

test('When a server runs on DATA_DIR, then restore refuses and changes nothing; once it stops, restore puts the backup in and keeps the old data aside', async () => {
  const dataDir = tempDir('restore-busy');
  const backupDir = tempDir('restore-busy-to');
  const server = await startServerProcess({ dataDir });
  const live: Live = { api: () => request(server.url), now: Date.now };
  const before = await signed(live);
  const backup = await npm('backup', [], { DATA_DIR: dataDir, BACKUP_DIR: backupDir });
  expect(backup.code).toBe(0);
  const where = lastLine(backup.stdout);
  // Written after the backup: the restore will take this away (into the kept-aside copy).
  const after = await signed(live);

  const refused = await npm('restore', [where], { DATA_DIR: dataDir });
  expect(refused.code).toBe(1);
  expect(refused.stderr).toContain(`restore refused: A Fieldfold server (process ${server.pid}, port ${server.port}`);
  expect(refused.stderr).toContain('Stop it first; nothing was changed.');
  expect(fs.readdirSync(dataDir).filter((n) => n.startsWith('before-restore-'))).toEqual([]);
  expect((await request(server.url).get(`/api/contracts/${after.contractId}`).set(after.grower.auth)).status).toBe(200);

  // Killed, it leaves a stale registration: a process that no longer exists does not count.
  await server.kill();
  expect(fs.existsSync(path.join(dataDir, 'running', `${server.pid}.json`))).toBe(true);
  const done = await npm('restore', [where], { DATA_DIR: dataDir });
  expect(done.stderr).toBe('');
  expect(done.code).toBe(0);
  const [aside] = fs.readdirSync(dataDir).filter((n) => n.startsWith('before-restore-'));
  expect(done.stdout).toContain(`the data it replaced is kept in ${path.join(dataDir, aside)}`);

  const now = await open(dataDir);
  expect((await now.query('SELECT id FROM contracts')).map((r: { id: string }) => r.id)).toEqual([before.contractId]);
  // The replaced database, with its WAL (the kill left committed pages there), is whole where it was put.
  const old = await open(path.join(dataDir, aside));
  expect((await old.query('SELECT id FROM contracts ORDER BY created_at')).map((r: { id: string }) => r.id)).toEqual([before.contractId, after.contractId]);
});

test('When the backup is damaged or DATABASE_URL names PostgreSQL, then the commands stop with a sentence and a non-zero exit', async () => {
  const dataDir = tempDir('backup-bad');
  const server = await startServerProcess({ dataDir });
  await server.stop();
  const backup = await npm('backup', [], { DATA_DIR: dataDir, BACKUP_DIR: tempDir('backup-bad-to') });
  const where = lastLine(backup.stdout);
  fs.appendFileSync(path.join(where, DATABASE_FILE), 'x');
  const damaged = await npm('restore', [where], { DATA_DIR: tempDir('backup-bad-target') });
  expect(damaged.code).toBe(1);
  expect(damaged.stderr).toContain('does not match the SHA-256 in its manifest');

  const pg = await npm('backup', [], { DATA_DIR: dataDir, DATABASE_URL: 'postgres://fieldfold@127.0.0.1:5432/fieldfold' });
  expect(pg.code).toBe(1);
  expect(pg.stderr).toContain('the backup of PostgreSQL (pg_dump / pg_restore) is not built yet');
  expect((await npm('restore', [], { DATA_DIR: dataDir })).code).toBe(2);
});

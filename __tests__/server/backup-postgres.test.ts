import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { migrations, openDatabase } from '../../server/db/data-source';
import { makeTestApp } from '../helpers/test-app';
import { market } from '../helpers/market';
import { freshTestDatabase, onPostgres, rawQuery } from '../helpers/test-database';

// scripts/backup-postgres.mjs on npm test's throw-away cluster: pg_dump -Fc of a database the app wrote, then
// pg_restore --clean over a changed copy and into an empty database, and the app reading the restored data.

const root = path.resolve(__dirname, '../..');

function backup(command: 'dump' | 'restore', url: string, file: string) {
  const r = spawnSync(process.execPath, [path.join(root, 'scripts', 'backup-postgres.mjs'), command, url, file], { encoding: 'utf8' });
  return { status: r.status, out: `${r.stdout}${r.stderr}` };
}

(onPostgres ? describe : describe.skip)('PostgreSQL backup and restore (pg_dump / pg_restore)', () => {
  let dir: string;
  beforeEach(() => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-pg-backup-'));
  });
  afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

  it('When a database is dumped, changed and restored, then it holds exactly what it held at the dump, and the app reads it', async () => {
    const t = await makeTestApp();
    try {
      const m = market(t);
      const grower = await m.grower('Greta Olsen');
      const block = await m.openBlock(grower);
      const url = t.dataSource.options.type === 'postgres' ? String((t.dataSource.options as { url?: string }).url) : '';
      const file = path.join(dir, 'fieldfold.dump');
      const dumped = backup('dump', url, file);
      expect(dumped.status).toBe(0);
      expect(fs.readFileSync(file).subarray(0, 5).toString('latin1')).toBe('PGDMP');
      expect(fs.existsSync(`${file}.partial`)).toBe(false);

      // After the dump: the block withdrawn and a second person signed up.
      await request(t.app).post(`/api/blocks/${block.id}/withdraw`).set(grower.auth).send({});
      await m.grazier('Wade Kellner');
      expect((await rawQuery<{ n: string }>(t.dataSource, 'SELECT COUNT(*) AS n FROM accounts')).map((r) => Number(r.n))).toEqual([2]);

      await t.dataSource.destroy();
      const restored = backup('restore', url, file);
      expect(restored.out).toBe(`[fieldfold] ${file} restored into ${url}\n`);
      const ds = await openDatabase(url);
      try {
        expect((await rawQuery<{ n: string }>(ds, 'SELECT COUNT(*) AS n FROM accounts')).map((r) => Number(r.n))).toEqual([1]);
        expect(await rawQuery(ds, 'SELECT status FROM blocks WHERE id = :id', { id: block.id })).toEqual([{ status: 'open' }]);
        // Every migration is recorded, and the market's SQL function came back with the schema.
        expect((await rawQuery<{ name: string }>(ds, 'SELECT name FROM migrations ORDER BY id')).map((r) => r.name)).toEqual(migrations.map((mg) => mg.name));
        const [{ d }] = await rawQuery<{ d: number }>(ds, 'SELECT ff_distance_miles(39.7, -121.9, 39.8, -121.9) AS d');
        expect(d).toBeGreaterThan(6.8);
      } finally {
        await ds.destroy();
      }
    } finally {
      // close() destroys the data source (already done here) and drops the database.
      await t.close().catch(() => undefined);
    }
  }, 120_000);

  it('When a dump is restored into an empty database (a new server), then the app starts on it with no migration left to run', async () => {
    const source = await freshTestDatabase();
    const target = await freshTestDatabase();
    const empty = target.target.replace(/\/[^/]+$/, `/empty_${path.basename(dir).replace(/[^a-z0-9]/gi, '').toLowerCase()}`);
    try {
      const ds = await openDatabase(source.target);
      await rawQuery(ds, `INSERT INTO accounts (id, email, password_hash, name, roles) VALUES ('a1', 'kept@test.example', 'x', 'Kept Grower', 'grower')`);
      await ds.destroy();
      const file = path.join(dir, 'new-server.dump');
      expect(backup('dump', source.target, file).status).toBe(0);
      const admin = await openDatabase(target.target);
      await admin.query(`CREATE DATABASE "${new URL(empty).pathname.slice(1)}"`);
      await admin.destroy();
      expect(backup('restore', empty, file).status).toBe(0);
      const fresh = await openDatabase(empty);
      try {
        expect(await fresh.showMigrations()).toBe(false);
        expect(await rawQuery(fresh, 'SELECT email FROM accounts')).toEqual([{ email: 'kept@test.example' }]);
      } finally {
        await fresh.destroy();
      }
    } finally {
      const admin = await openDatabase(target.target);
      await admin.query(`DROP DATABASE IF EXISTS "${new URL(empty).pathname.slice(1)}" WITH (FORCE)`);
      await admin.destroy();
      await source.drop();
      await target.drop();
    }
  }, 120_000);

  it('When the dump file is missing or the URL is not PostgreSQL, then the script says so and exits 1', () => {
    const missing = backup('restore', 'postgres://127.0.0.1:1/none', path.join(dir, 'nothing.dump'));
    expect(missing.status).toBe(1);
    expect(missing.out).toMatch(/no dump at/);
    const wrong = backup('dump', 'mysql://db/x', path.join(dir, 'x.dump'));
    expect(wrong.status).toBe(1);
    expect(wrong.out).toMatch(/usage: node scripts\/backup-postgres\.mjs dump\|restore postgres:\/\/… FILE/);
  });
});

// npm run seed:reset: deletes the local database and its uploads (DATA_DIR, default ./data) so the next start
// migrates and seeds afresh. The token secret is kept, so nothing else needs configuring.
import fs from 'node:fs';
import path from 'node:path';
import { root } from './lib.mjs';

// A PostgreSQL database (DATABASE_URL) may be anybody's: this command never empties one.
if (process.env.DATABASE_URL) {
  console.error('[fieldfold] seed:reset deletes the SQLite file in DATA_DIR only; with DATABASE_URL set, drop and create that database yourself (dropdb / createdb), then npm start seeds it.');
  process.exit(1);
}
const dataDir = path.resolve(root, process.env.DATA_DIR ?? 'data');
for (const f of ['fieldfold.sqlite', 'fieldfold.sqlite-wal', 'fieldfold.sqlite-shm']) fs.rmSync(path.join(dataDir, f), { force: true });
// Uploaded photos belong to the database's blocks: they go with it.
fs.rmSync(path.join(dataDir, 'uploads'), { recursive: true, force: true });
// So do the PDF records stored for its contracts and invoices.
fs.rmSync(path.join(dataDir, 'documents'), { recursive: true, force: true });
// And the payments fake's copy of its invoices (the webhook secret stays, like the token secret).
fs.rmSync(path.join(dataDir, 'payments-fake'), { recursive: true, force: true });
console.log(`[fieldfold] demo data reset in ${dataDir}; the next npm start seeds the Calder Valley district again.`);

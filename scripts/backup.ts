// npm run backup: a consistent copy of the live database (online, while the server runs: the SQLite file in
// DATA_DIR, or with DATABASE_URL the PostgreSQL database through pg_dump), the uploaded photos and the stored
// documents, into BACKUP_DIR (default: a `backups` folder beside DATA_DIR), with a manifest. The backup's path is
// the last line printed, for scripts: `dir=$(npm run -s backup | tail -n 1)`.
import path from 'node:path';
import { resolveDataDir } from '../server/config/env';
import { takeBackup } from './backups/backup';

async function main() {
  const dataDir = resolveDataDir();
  const backupDir = process.env.BACKUP_DIR ? path.resolve(process.env.BACKUP_DIR) : path.join(path.dirname(dataDir), 'backups');
  const { path: where, manifest } = await takeBackup({ dataDir, backupDir });
  const rows = Object.values(manifest.database.tables).reduce((n, c) => n + c, 0);
  const f = manifest.files;
  const db = manifest.database.engine === 'postgres' ? `PostgreSQL ${manifest.database.from}` : 'SQLite';
  console.log(`[fieldfold] backed up ${dataDir}: ${db} database ${manifest.database.bytes} bytes (${rows} rows, integrity ${manifest.database.integrity}, as of ${manifest.database.snapshotAt}), ${f.uploads.count} uploads, ${f.documents.count} documents`);
  console.log(where);
}

main().catch((err) => {
  console.error(`[fieldfold] backup failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});

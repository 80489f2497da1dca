// npm run restore -- PATH: puts the backup at PATH back into DATA_DIR (and, with DATABASE_URL, into that PostgreSQL
// database). Refuses (exit 1, nothing changed) while a server runs on DATA_DIR or, on PostgreSQL, is connected to
// the database; keeps the data it replaces in DATA_DIR/before-restore-<time>/. See scripts/backups/restore.ts.
import { resolveDataDir } from '../server/config/env';
import { restoreBackup, RestoreStoppedPartWay } from './backups/restore';

async function main() {
  const backupPath = process.argv[2];
  if (!backupPath || process.argv.length > 3) {
    console.error('Usage: npm run restore -- <backup folder printed by npm run backup>');
    process.exit(2);
  }
  const dataDir = resolveDataDir();
  const { manifest, keptAside } = await restoreBackup({ backupPath, dataDir });
  const into = manifest.database.engine === 'postgres' ? `${dataDir} and the PostgreSQL database of DATABASE_URL` : dataDir;
  console.log(`[fieldfold] restored the backup of ${manifest.database.snapshotAt} into ${into}`);
  console.log(keptAside ? `[fieldfold] the data it replaced is kept in ${keptAside}` : '[fieldfold] DATA_DIR held no data before');
}

main().catch((err) => {
  // Everything but a stop part-way is a refusal that changed nothing (a running server, a damaged backup).
  console.error(`[fieldfold] restore ${err instanceof RestoreStoppedPartWay ? 'failed' : 'refused'}: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});

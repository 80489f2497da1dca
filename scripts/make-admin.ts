// npm run make-admin -- someone@example.com
// Grants the operator (admin) role to an existing account. Sign-up never grants it; only this command and the seed do.
import { loadConfig } from '../server/config/env';
import { openDatabase } from '../server/db/data-source';
import { Account } from '../server/modules/accounts/account.entity';

async function main() {
  const email = process.argv[2]?.trim().toLowerCase();
  if (!email) {
    console.error('Usage: npm run make-admin -- <email of an existing account>');
    process.exit(2);
  }
  const config = loadConfig();
  // The server's own database: DATABASE_URL when set, else the SQLite file in DATA_DIR.
  const ds = await openDatabase(config.databaseUrl ?? config.databasePath);
  try {
    const repo = ds.getRepository(Account);
    const account = await repo.findOneBy({ email });
    if (!account) {
      console.error(`No account with email ${email} in ${config.databaseUrl ? 'the PostgreSQL database' : config.databasePath}`);
      process.exit(1);
    }
    const roles = new Set(account.roles.split(',').filter(Boolean));
    roles.add('admin');
    account.roles = [...roles].join(',');
    await repo.save(account);
    console.log(`${email} now holds: ${account.roles}`);
  } finally {
    await ds.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});

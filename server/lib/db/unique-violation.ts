import { QueryFailedError } from 'typeorm';

// A once-only rule that the database enforced (a unique index) surfaces as a driver error; the use case
// turns it into its 409 or its idempotent answer. better-sqlite3 says SQLITE_CONSTRAINT_UNIQUE (or
// SQLITE_CONSTRAINT_PRIMARYKEY); PostgreSQL says SQLSTATE 23505.
export function isUniqueViolation(err: unknown): boolean {
  const driver = err instanceof QueryFailedError ? (err.driverError as { code?: unknown }) : (err as { code?: unknown } | null);
  const code = driver?.code;
  return code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || code === '23505';
}

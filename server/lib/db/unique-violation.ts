/** True when a write failed on a unique index or key (SQLite via better-sqlite3, or PostgreSQL). */
export function isUniqueViolation(err: unknown): boolean {
  const e = err as { code?: string; driverError?: { code?: string }; message?: string } | null;
  const code = e?.driverError?.code ?? e?.code;
  if (code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || code === '23505') return true;
  return typeof e?.message === 'string' && e.message.includes('UNIQUE constraint failed');
}

// Types for scripts/backup-postgres.mjs, which npm run backup / restore (TypeScript) call.
export function dumpPostgres(url: string, file: string, options?: { snapshot?: string }): number;
export function checkDump(file: string): void;
export function restorePostgres(url: string, file: string): void;

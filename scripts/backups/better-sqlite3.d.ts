// The part of better-sqlite3 12's API the backup commands use (the package ships no types, and
// @types/better-sqlite3 is not a dependency). Signatures follow its docs/api.md.
declare module 'better-sqlite3' {
  interface Statement {
    all(...params: unknown[]): unknown[];
    get(...params: unknown[]): unknown;
    run(...params: unknown[]): { changes: number };
  }
  interface BackupProgress {
    totalPages: number;
    remainingPages: number;
  }
  class Database {
    constructor(filename: string, options?: { readonly?: boolean; fileMustExist?: boolean; timeout?: number });
    pragma(source: string, options?: { simple?: boolean }): unknown;
    prepare(source: string): Statement;
    exec(source: string): this;
    backup(destination: string, options?: { attached?: string; progress?: (info: BackupProgress) => number | undefined }): Promise<BackupProgress>;
    close(): this;
  }
  export = Database;
}

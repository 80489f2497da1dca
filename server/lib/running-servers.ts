import fs from 'node:fs';
import path from 'node:path';

// Who is using a DATA_DIR right now: each server process (and a restore while it runs) keeps a small file
// DATA_DIR/running/<pid>.json from its start to its stop. A file whose process is gone (killed with SIGKILL, a
// power cut) is stale and ignored: liveness is asked of the operating system (`process.kill(pid, 0)`), never
// read from the file alone. One file per process, so several servers on one DATA_DIR are all seen.
//
// Why files and not a lock on the database: SQLite's own locks are held only while a statement runs, and a
// PostgreSQL deployment has no database file at all; the folder is what a restore replaces.
//
// The check is "write my own file, then look for the others" on both sides, so a server starting while a
// restore begins cannot both miss each other: at least one of them sees the other and stops.

export type RunningRole = 'server' | 'restore';

export interface RunningProcess {
  pid: number;
  role: RunningRole;
  /** ISO instant the process wrote its file. */
  startedAt: string;
  /** What else it said about itself (the server's port). */
  port?: number;
}

function dirOf(dataDir: string): string {
  return path.join(dataDir, 'running');
}

/** True while a process with this id exists (EPERM: it exists but belongs to someone else). */
export function isAlive(pid: number): boolean {
  if (!Number.isSafeInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function readEntry(file: string): RunningProcess | null {
  try {
    const parsed = JSON.parse(fs.readFileSync(file, 'utf8')) as Partial<RunningProcess>;
    if (typeof parsed.pid !== 'number' || (parsed.role !== 'server' && parsed.role !== 'restore')) return null;
    return { pid: parsed.pid, role: parsed.role, startedAt: String(parsed.startedAt ?? ''), ...(typeof parsed.port === 'number' ? { port: parsed.port } : {}) };
  } catch {
    return null;
  }
}

/** The live processes registered in DATA_DIR (this process excluded); stale files are removed on the way. */
export function runningProcesses(dataDir: string): RunningProcess[] {
  const dir = dirOf(dataDir);
  let names: string[];
  try {
    names = fs.readdirSync(dir);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  const live: RunningProcess[] = [];
  for (const name of names) {
    if (!/^\d+\.json$/.test(name)) continue;
    const file = path.join(dir, name);
    const entry = readEntry(file);
    if (entry && entry.pid === process.pid) continue;
    if (entry && isAlive(entry.pid)) live.push(entry);
    else fs.rmSync(file, { force: true });
  }
  return live;
}

/**
 * Registers this process in DATA_DIR and returns the function that removes the registration (also run on
 * process exit, so `process.exit()` and an uncaught error clean up too; only SIGKILL leaves a stale file).
 */
export function registerRunning(dataDir: string, role: RunningRole, extra: { port?: number } = {}): () => void {
  const dir = dirOf(dataDir);
  fs.mkdirSync(dir, { recursive: true });
  const file = path.join(dir, `${process.pid}.json`);
  const entry: RunningProcess = { pid: process.pid, role, startedAt: new Date().toISOString(), ...extra };
  fs.writeFileSync(file, `${JSON.stringify(entry)}\n`, { mode: 0o644 });
  let removed = false;
  const remove = () => {
    if (removed) return;
    removed = true;
    process.off('exit', remove);
    fs.rmSync(file, { force: true });
  };
  process.on('exit', remove);
  return remove;
}

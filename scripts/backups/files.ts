import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

// Copying the stored files (DATA_DIR/uploads, DATA_DIR/documents) into a backup and back, with each file's
// size and SHA-256 in the manifest so a restore can check it got what was taken.

export interface FileRecord {
  /** Path inside the folder, with forward slashes ("grazing-log/3f….pdf"). */
  path: string;
  bytes: number;
  sha256: string;
}

export function sha256File(file: string): string {
  const hash = crypto.createHash('sha256');
  const fd = fs.openSync(file, 'r');
  try {
    const buf = Buffer.alloc(1 << 20);
    let n: number;
    while ((n = fs.readSync(fd, buf, 0, buf.length, null)) > 0) hash.update(buf.subarray(0, n));
  } finally {
    fs.closeSync(fd);
  }
  return hash.digest('hex');
}

/** Flushes a file (or a folder's entries) to disk. */
export function fsyncPath(p: string): void {
  const fd = fs.openSync(p, 'r');
  try {
    fs.fsyncSync(fd);
  } finally {
    fs.closeSync(fd);
  }
}

/** Every regular file under `dir`, sorted; the stores' half-written temporaries (`*.tmp`) are not data. */
function listFiles(dir: string): string[] {
  const out: string[] = [];
  const walk = (rel: string) => {
    let entries: fs.Dirent[];
    try {
      entries = fs.readdirSync(path.join(dir, rel), { withFileTypes: true });
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return;
      throw err;
    }
    for (const e of entries) {
      const r = rel ? `${rel}/${e.name}` : e.name;
      if (e.isDirectory()) walk(r);
      else if (e.isFile() && !e.name.endsWith('.tmp')) out.push(r);
    }
  };
  walk('');
  return out.sort();
}

/**
 * Copies the files of `from` into `to` (created), each flushed, and returns what was copied. A file that
 * disappears while the copy runs (a photo deleted meanwhile) is skipped: it is gone from the live data too.
 */
export function copyTree(from: string, to: string): FileRecord[] {
  const copied: FileRecord[] = [];
  fs.mkdirSync(to, { recursive: true });
  for (const rel of listFiles(from)) {
    const src = path.join(from, ...rel.split('/'));
    const dest = path.join(to, ...rel.split('/'));
    fs.mkdirSync(path.dirname(dest), { recursive: true });
    try {
      fs.copyFileSync(src, dest);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') continue;
      throw err;
    }
    fsyncPath(dest);
    copied.push({ path: rel, bytes: fs.statSync(dest).size, sha256: sha256File(dest) });
  }
  return copied;
}

/** The files of `records` that are missing under `dir` or differ from their recorded hash. */
export function mismatchedFiles(dir: string, records: FileRecord[]): string[] {
  return records
    .filter((r) => {
      const file = path.join(dir, ...r.path.split('/'));
      return !fs.existsSync(file) || fs.statSync(file).size !== r.bytes || sha256File(file) !== r.sha256;
    })
    .map((r) => r.path);
}

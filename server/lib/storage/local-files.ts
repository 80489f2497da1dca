import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';

// What the local stores (photos, documents) share: names are checked before they touch the file system, and
// files are written whole or not at all.

/** Absolute path of `name` under `root`, refusing anything that does not match `pattern` or would leave root. */
export function pathInside(root: string, name: string, pattern: RegExp): string {
  // Names come from our own database, but check anyway: a bad row must not read outside the folder.
  if (!pattern.test(name) || name.split('/').some((part) => part === '..' || part === '.' || part === '')) {
    throw new Error('Not a stored file name');
  }
  const full = path.join(root, name);
  if (!full.startsWith(root + path.sep)) throw new Error('Not a stored file name');
  return full;
}

/**
 * Writes `bytes` to `file` atomically: into a temporary file beside it (same folder, so the same file
 * system), flushed to disk, then renamed over the target. A reader sees the old file or the new one, never
 * half of one, and a crash leaves at most a stray `.tmp` file. The folder is created when missing.
 */
export async function writeFileAtomic(file: string, bytes: Buffer): Promise<void> {
  const dir = path.dirname(file);
  await fs.mkdir(dir, { recursive: true });
  const tmp = `${file}.${crypto.randomBytes(6).toString('hex')}.tmp`;
  try {
    const handle = await fs.open(tmp, 'wx', 0o600);
    try {
      await handle.writeFile(bytes);
      await handle.sync();
    } finally {
      await handle.close();
    }
    await fs.rename(tmp, file);
  } catch (err) {
    await fs.rm(tmp, { force: true });
    throw err;
  }
  // The rename itself is durable only once the folder's entry is on disk.
  const d = await fs.open(dir, 'r');
  try {
    await d.sync();
  } finally {
    await d.close();
  }
}

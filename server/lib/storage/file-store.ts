import fsp from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { pathInside, writeFileAtomic } from './local-files';

// Generated files (PDF records) live under DATA_DIR/documents by key, outside the web root. Keys are chosen
// by the server ("grazing-log/<uuid>.pdf"), never by a sender. This is the port; the local folder is its
// adapter, and an object store could be another with the same four calls.

export interface FileStore {
  /** Stores `bytes` under `key`, replacing what was there; atomic (temp file + rename). */
  put(key: string, bytes: Buffer): Promise<void>;
  /** The bytes under `key`, or null when nothing is stored there. */
  get(key: string): Promise<Buffer | null>;
  /** A stream of the bytes and their size, or null when nothing is stored there (checked before it returns). */
  open(key: string): Promise<{ stream: Readable; sizeBytes: number } | null>;
  /** Removes the file; one already gone is not an error. */
  delete(key: string): Promise<void>;
}

/** Lower-case folder names and a file name with an extension: "invoice/2f0c….pdf". */
const KEY = /^[a-z0-9][a-z0-9-]*(\/[a-z0-9][a-z0-9-]*)*\/[a-z0-9][a-z0-9-]*\.[a-z0-9]{1,8}$/;

export function isFileStoreKey(key: string): boolean {
  return KEY.test(key) && key.length <= 200;
}

function missing(err: unknown): boolean {
  return (err as NodeJS.ErrnoException)?.code === 'ENOENT';
}

export function localFileStore(dir: string): FileStore {
  const root = path.resolve(dir);
  const pathOf = (key: string) => {
    if (key.length > 200) throw new Error('Not a stored file name');
    return pathInside(root, key, KEY);
  };
  return {
    async put(key, bytes) {
      await writeFileAtomic(pathOf(key), bytes);
    },
    async get(key) {
      try {
        return await fsp.readFile(pathOf(key));
      } catch (err) {
        if (missing(err)) return null;
        throw err;
      }
    },
    async open(key) {
      const file = pathOf(key);
      let handle: fsp.FileHandle;
      try {
        handle = await fsp.open(file, 'r');
      } catch (err) {
        if (missing(err)) return null;
        throw err;
      }
      // Stat and stream the same open file, so a replacement written meanwhile cannot mix sizes and bytes.
      const { size } = await handle.stat();
      return { stream: handle.createReadStream({ autoClose: true }), sizeBytes: size };
    },
    async delete(key) {
      await fsp.rm(pathOf(key), { force: true });
    },
  };
}

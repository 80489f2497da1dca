import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';
import { pathInside, writeFileAtomic } from './local-files';

// Uploaded photos live as files under DATA_DIR/uploads (outside the web root), each under a random name the
// server chose: a sender's file name never reaches the file system, and names cannot be guessed.

export interface PhotoStore {
  /** Writes the bytes under a new random name with `extension` (".jpg") and returns the name. */
  save(bytes: Buffer, extension: string): Promise<string>;
  /** Absolute path of a stored file. */
  pathOf(fileName: string): string;
  /** Removes a stored file; a file already gone is not an error. */
  remove(fileName: string): Promise<void>;
}

const STORED_NAME = /^[0-9a-f]{32}\.(jpg|png|webp)$/;

export function localPhotoStore(dir: string): PhotoStore {
  const root = path.resolve(dir);
  const pathOf = (fileName: string) => pathInside(root, fileName, STORED_NAME);
  return {
    async save(bytes, extension) {
      const name = crypto.randomBytes(16).toString('hex') + extension;
      // A fresh random name (a collision is vanishingly unlikely), written whole or not at all.
      await writeFileAtomic(pathOf(name), bytes);
      return name;
    },
    pathOf,
    async remove(fileName) {
      await fs.rm(pathOf(fileName), { force: true });
    },
  };
}

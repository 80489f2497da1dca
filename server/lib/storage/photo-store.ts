import crypto from 'node:crypto';
import fs from 'node:fs/promises';
import path from 'node:path';

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
  const pathOf = (fileName: string) => {
    // Names come from our own database, but check anyway: a bad row must not read outside the folder.
    if (!STORED_NAME.test(fileName)) throw new Error('Not a stored photo name');
    return path.join(root, fileName);
  };
  return {
    async save(bytes, extension) {
      await fs.mkdir(root, { recursive: true });
      const name = crypto.randomBytes(16).toString('hex') + extension;
      // 'wx': never overwrite, even on a (vanishingly unlikely) name collision.
      await fs.writeFile(pathOf(name), bytes, { flag: 'wx', mode: 0o600 });
      return name;
    },
    pathOf,
    async remove(fileName) {
      await fs.rm(pathOf(fileName), { force: true });
    },
  };
}

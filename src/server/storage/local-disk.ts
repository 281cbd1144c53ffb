import { randomBytes } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, open, readFile, rename, rm, stat } from 'node:fs/promises';
import path from 'node:path';
import { Readable } from 'node:stream';
import { FileNotFound, type FileStore } from './types';

/** Letters, digits, dot, dash and underscore per segment; no empty, "." or ".." segment. */
const SEGMENT = /^[A-Za-z0-9_][A-Za-z0-9._-]*$/;

/** Keys are names, not paths: `checkKey('attachments/ab/x')` passes, `checkKey('../x')` throws. */
export function checkKey(key: string): string[] {
  const parts = key.split('/');
  if (key.length === 0 || key.length > 255 || !parts.every((p) => SEGMENT.test(p) && p !== '..' && !p.startsWith('.'))) {
    throw new Error('Invalid storage key.');
  }
  return parts;
}

/**
 * A FileStore on local disk under one root folder. A write goes to a temporary file in the same
 * folder, is flushed to disk, then renamed into place, so a crash leaves either the whole file
 * or nothing under the key (at worst a `.tmp-*` file, which no key can name).
 */
export class LocalDiskStore implements FileStore {
  readonly root: string;

  constructor(root: string) {
    this.root = path.resolve(root);
  }

  /** The absolute path of a key, refusing anything that would land outside the root. */
  pathOf(key: string): string {
    const full = path.resolve(this.root, ...checkKey(key));
    if (!full.startsWith(this.root + path.sep)) throw new Error('Invalid storage key.');
    return full;
  }

  async put(key: string, bytes: Uint8Array): Promise<void> {
    const target = this.pathOf(key);
    await mkdir(path.dirname(target), { recursive: true });
    const temp = path.join(path.dirname(target), `.tmp-${randomBytes(8).toString('hex')}`);
    try {
      const handle = await open(temp, 'wx', 0o640);
      try {
        await handle.writeFile(bytes);
        await handle.sync();
      } finally {
        await handle.close();
      }
      await rename(temp, target);
    } catch (error) {
      await rm(temp, { force: true });
      throw error;
    }
  }

  async get(key: string): Promise<Buffer> {
    try {
      return await readFile(this.pathOf(key));
    } catch (error) {
      throw missing(error, key);
    }
  }

  async stream(key: string): Promise<{ body: ReadableStream<Uint8Array>; sizeBytes: number }> {
    const file = this.pathOf(key);
    try {
      const { size } = await stat(file);
      const body = Readable.toWeb(createReadStream(file)) as unknown as ReadableStream<Uint8Array>;
      return { body, sizeBytes: size };
    } catch (error) {
      throw missing(error, key);
    }
  }

  async exists(key: string): Promise<boolean> {
    try {
      return (await stat(this.pathOf(key))).isFile();
    } catch {
      return false;
    }
  }

  async delete(key: string): Promise<void> {
    await rm(this.pathOf(key), { force: true });
  }
}

function missing(error: unknown, key: string): unknown {
  return (error as NodeJS.ErrnoException)?.code === 'ENOENT' ? new FileNotFound(key) : error;
}

import { constants } from 'node:fs';
import { access, copyFile, mkdir, open, rename, rm, rmdir, stat, unlink } from 'node:fs/promises';
import { dirname, join, relative, resolve, sep } from 'node:path';
import type { Readable } from 'node:stream';
import { StorageNotFoundError, type ByteRange, type StorageDriver, type StorageStat } from './storage-driver';

const isMissing = (error: unknown) => (error as NodeJS.ErrnoException).code === 'ENOENT';

/** Objects as plain files under `<root>/<key>`; `put` is a rename when source and root share a disk. */
export class LocalStorageDriver implements StorageDriver {
  readonly name = 'local' as const;
  private readonly root: string;

  constructor(root: string) {
    this.root = resolve(root);
  }

  /** The file behind a key; the key pattern already forbids "..", this is a second fence. */
  pathOf(key: string): string {
    const path = resolve(this.root, ...key.split('/'));
    const rel = relative(this.root, path);
    if (rel === '' || rel.startsWith('..') || rel.split(sep).includes('..')) {
      throw new Error(`storage key ${key} leaves the storage root`);
    }
    return path;
  }

  async put(key: string, fromLocalPath: string): Promise<void> {
    const target = this.pathOf(key);
    await mkdir(dirname(target), { recursive: true });
    try {
      await rename(fromLocalPath, target);
      return;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EXDEV') throw error;
    }
    // Another file system: copy beside the target, then rename, so a reader never sees half a file.
    const partial = `${target}.partial`;
    try {
      await copyFile(fromLocalPath, partial);
      await rename(partial, target);
    } finally {
      await rm(partial, { force: true });
    }
    await unlink(fromLocalPath);
  }

  async openRead(key: string, range?: ByteRange): Promise<Readable> {
    const path = this.pathOf(key);
    let handle;
    try {
      handle = await open(path, 'r');
    } catch (error) {
      if (isMissing(error)) throw new StorageNotFoundError(key);
      throw error;
    }
    // The stream owns the handle from here and closes it when it ends or is destroyed.
    return handle.createReadStream({ start: range?.start, end: range?.end, autoClose: true });
  }

  async stat(key: string): Promise<StorageStat | null> {
    try {
      const s = await stat(this.pathOf(key));
      if (!s.isFile()) return null;
      return { size: s.size, lastModified: s.mtime };
    } catch (error) {
      if (isMissing(error)) return null;
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    const path = this.pathOf(key);
    await rm(path, { force: true });
    // Tidy the per-recording folder once its last file is gone; a folder still in use stays.
    try {
      await rmdir(dirname(path));
    } catch {
      // Not empty, or already gone.
    }
  }

  async withLocalFile<T>(key: string, fn: (path: string) => Promise<T>): Promise<T> {
    const path = this.pathOf(key);
    try {
      await access(path, constants.R_OK);
    } catch (error) {
      if (isMissing(error)) throw new StorageNotFoundError(key);
      throw error;
    }
    return fn(path);
  }

  async check(): Promise<void> {
    await mkdir(this.root, { recursive: true });
    await access(this.root, constants.W_OK);
  }

  toString(): string {
    return `local storage under ${join(this.root)}`;
  }
}

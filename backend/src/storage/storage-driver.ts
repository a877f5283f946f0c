import type { Readable } from 'node:stream';

export interface StorageStat {
  size: number;
  /** The store's own entity tag, quoted as in HTTP, when it has one. */
  etag?: string;
  lastModified?: Date;
}

/** Inclusive byte range, as in HTTP Range and fs.createReadStream. */
export interface ByteRange {
  start: number;
  end: number;
}

export interface PutOptions {
  contentType?: string;
}

/** Thrown by openRead and withLocalFile when the key holds nothing. */
export class StorageNotFoundError extends Error {
  override name = 'StorageNotFoundError';
  constructor(readonly key: string) {
    super(`no stored object at ${key}`);
  }
}

/**
 * One place where bytes live. Keys are validated by StorageService before they get here; a
 * driver only maps them onto its medium.
 */
export interface StorageDriver {
  readonly name: 'local' | 's3';
  /** Stores the file at `fromLocalPath` under `key` and consumes it (the source is gone afterwards). */
  put(key: string, fromLocalPath: string, options?: PutOptions): Promise<void>;
  openRead(key: string, range?: ByteRange): Promise<Readable>;
  stat(key: string): Promise<StorageStat | null>;
  /** Removing a missing key is not an error. */
  delete(key: string): Promise<void>;
  /** Runs `fn` with a local path holding the object's bytes; the path must be read, never written. */
  withLocalFile<T>(key: string, fn: (path: string) => Promise<T>): Promise<T>;
  /** Throws with a message for people when the store cannot be reached. */
  check(): Promise<void>;
}

import type { Request } from 'express';
import { createHash, randomBytes } from 'node:crypto';
import { createWriteStream, mkdirSync } from 'node:fs';
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import { Transform, type TransformCallback } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { StorageEngine } from 'multer';

/** What the engine adds to multer's file record. */
export interface HashedFileInfo {
  /** Server-chosen temporary path; the client's file name is never part of it. */
  path: string;
  destination: string;
  filename: string;
  size: number;
  /** Hex SHA-256 of every byte received. */
  sha256: string;
  /** Result of `inspectHead` (e.g. the media type), null for an empty file. */
  detectedType: string | null;
}

export type HashedFile = Express.Multer.File & HashedFileInfo;

export interface HashingDiskStorageOptions {
  /** Directory for temporary files (created if missing). */
  directory: string;
  /** How many leading bytes `inspectHead` sees. */
  headBytes: number;
  /**
   * Looks at the first `headBytes` bytes (fewer for a shorter file, never called for an empty
   * one) before the rest is written on; throwing stops the upload and removes the file.
   */
  inspectHead: (head: Buffer) => Promise<string>;
}

/**
 * Collects the head of the stream, holds the data back until `inspect` has judged it, then lets
 * everything through. Holding back makes the upload wait (backpressure) rather than buffer.
 */
class HeadInspector extends Transform {
  private head: Buffer[] = [];
  private headLength = 0;
  private judged = false;
  result: string | null = null;

  constructor(
    private readonly headBytes: number,
    private readonly inspect: (head: Buffer) => Promise<string>,
  ) {
    super();
  }

  override _transform(chunk: Buffer, _encoding: BufferEncoding, callback: TransformCallback): void {
    if (this.judged) {
      callback(null, chunk);
      return;
    }
    this.head.push(chunk);
    this.headLength += chunk.length;
    if (this.headLength < this.headBytes) {
      callback();
      return;
    }
    this.judge(callback);
  }

  override _flush(callback: TransformCallback): void {
    if (this.judged || this.headLength === 0) {
      callback();
      return;
    }
    this.judge(callback);
  }

  private judge(callback: TransformCallback): void {
    const held = Buffer.concat(this.head);
    this.head = [];
    this.judged = true;
    this.inspect(held.subarray(0, this.headBytes)).then(
      (result) => {
        this.result = result;
        callback(null, held);
      },
      (error: unknown) => callback(error instanceof Error ? error : new Error(String(error))),
    );
  }
}

/**
 * multer storage engine: streams an uploaded file to `<directory>/<random>` while computing its
 * SHA-256 and checking its first bytes. Nothing is buffered beyond the head and the stream
 * buffers. On any error (a failed check, a broken connection, a full disk) the partial file is
 * removed before multer hears of it, so an interrupted upload leaves nothing behind.
 */
export class HashingDiskStorage implements StorageEngine {
  constructor(private readonly options: HashingDiskStorageOptions) {
    mkdirSync(options.directory, { recursive: true, mode: 0o700 });
  }

  _handleFile(_req: Request, file: Express.Multer.File, callback: (error?: unknown, info?: Partial<HashedFileInfo>) => void): void {
    const filename = `upload-${randomBytes(16).toString('hex')}`;
    const path = join(this.options.directory, filename);
    const hash = createHash('sha256');
    let size = 0;
    const inspector = new HeadInspector(this.options.headBytes, this.options.inspectHead);
    const counter = new Transform({
      transform(chunk: Buffer, _encoding, done) {
        hash.update(chunk);
        size += chunk.length;
        done(null, chunk);
      },
    });
    const sink = createWriteStream(path, { flags: 'wx', mode: 0o600 });
    pipeline(file.stream, counter, inspector, sink).then(
      () =>
        callback(null, {
          path,
          destination: this.options.directory,
          filename,
          size,
          sha256: hash.digest('hex'),
          detectedType: inspector.result,
        }),
      (error: unknown) => {
        // The pipeline fails as soon as one stream does, which can be before the file is even
        // open (a client gone at once): removing it then would race the open that creates it.
        // So the partial file goes once the file stream has closed, and only then the error.
        const removePartial = () =>
          rm(path, { force: true }).then(
            () => callback(error),
            () => callback(error),
          );
        if (sink.closed) void removePartial();
        else sink.once('close', () => void removePartial());
      },
    );
  }

  _removeFile(_req: Request, file: Express.Multer.File & Partial<HashedFileInfo>, callback: (error: Error | null) => void): void {
    if (!file.path) {
      callback(null);
      return;
    }
    rm(file.path, { force: true }).then(
      () => callback(null),
      (error: unknown) => callback(error instanceof Error ? error : new Error(String(error))),
    );
  }
}

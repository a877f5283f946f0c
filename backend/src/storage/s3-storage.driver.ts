import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { Upload } from '@aws-sdk/lib-storage';
import { randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream } from 'node:fs';
import { rm, unlink } from 'node:fs/promises';
import { join } from 'node:path';
import { Readable, Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { S3Settings } from '../config/app-config';
import { StorageNotFoundError, type ByteRange, type PutOptions, type StorageDriver, type StorageStat } from './storage-driver';

/** Multipart part size: large enough for few requests, small enough to keep upload memory bounded. */
const PART_SIZE = 16 * 1024 * 1024;
const PART_QUEUE = 2;

function isNotFound(error: unknown): boolean {
  if (error instanceof S3ServiceException) {
    return error.name === 'NotFound' || error.name === 'NoSuchKey' || error.$metadata?.httpStatusCode === 404;
  }
  return false;
}

/**
 * The body of a ranged GET, cut to exactly the bytes asked for. S3 itself answers with just the
 * range, but some compatible stores return more (a closed range read as open-ended) or ignore
 * Range and send the whole object; a response must never carry more bytes than it announced.
 */
export function exactRange(body: Readable, range: ByteRange, contentRange: string | undefined): Readable {
  const returnedStart = /^bytes (\d+)-\d+\/(\d+|\*)$/.exec(contentRange ?? '');
  let skip = returnedStart ? range.start - Number(returnedStart[1]) : range.start;
  if (skip < 0) throw new Error(`the store returned bytes from ${returnedStart?.[1]} for a range starting at ${range.start}`);
  let left = range.end - range.start + 1;
  const cut = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      if (left === 0) {
        done();
        return;
      }
      if (skip >= chunk.length) {
        skip -= chunk.length;
        done();
        return;
      }
      const part = chunk.subarray(skip, skip + left);
      skip = 0;
      left -= part.length;
      done(null, part.length > 0 ? part : undefined);
      if (left === 0) {
        // Everything asked for is out: stop reading the rest of an oversized body.
        this.push(null);
        body.destroy();
      }
    },
  });
  body.on('error', (error) => cut.destroy(error));
  return body.pipe(cut);
}

/** Objects in one bucket of AWS S3 or an S3-compatible store. */
export class S3StorageDriver implements StorageDriver {
  readonly name = 's3' as const;
  private readonly client: S3Client;
  private readonly bucket: string;

  /** `tmpDir`: where withLocalFile downloads objects for tools that need a path (ffprobe, ffmpeg). */
  constructor(
    settings: S3Settings,
    private readonly tmpDir: string,
  ) {
    this.bucket = settings.bucket;
    this.client = new S3Client({
      region: settings.region,
      endpoint: settings.endpoint,
      forcePathStyle: settings.forcePathStyle,
      credentials:
        settings.accessKeyId && settings.secretAccessKey
          ? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey }
          : undefined,
      // Since early 2025 the SDK adds CRC32 checksums to every upload and, for streamed bodies,
      // sends them as an aws-chunked body with a trailer. Many S3-compatible stores (and the
      // fake in our tests) do not decode that framing and silently store it as part of the
      // object. Checksums only where the API demands them keeps uploads byte-exact everywhere;
      // TLS and our own SHA-256 of the original already guard the bytes.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }

  async put(key: string, fromLocalPath: string, options: PutOptions = {}): Promise<void> {
    const upload = new Upload({
      client: this.client,
      params: { Bucket: this.bucket, Key: key, Body: createReadStream(fromLocalPath), ContentType: options.contentType },
      partSize: PART_SIZE,
      queueSize: PART_QUEUE,
      leavePartsOnError: false,
    });
    await upload.done();
    await unlink(fromLocalPath);
  }

  async openRead(key: string, range?: ByteRange): Promise<Readable> {
    try {
      const res = await this.client.send(
        new GetObjectCommand({
          Bucket: this.bucket,
          Key: key,
          Range: range ? `bytes=${range.start}-${range.end}` : undefined,
        }),
      );
      if (!(res.Body instanceof Readable)) throw new Error(`S3 returned no readable body for ${key}`);
      if (!range) return res.Body;
      return exactRange(res.Body, range, res.ContentRange);
    } catch (error) {
      if (isNotFound(error)) throw new StorageNotFoundError(key);
      throw error;
    }
  }

  async stat(key: string): Promise<StorageStat | null> {
    try {
      const res = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }));
      return { size: res.ContentLength ?? 0, etag: res.ETag, lastModified: res.LastModified };
    } catch (error) {
      if (isNotFound(error)) return null;
      throw error;
    }
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }

  async withLocalFile<T>(key: string, fn: (path: string) => Promise<T>): Promise<T> {
    const path = join(this.tmpDir, `s3-${randomBytes(12).toString('hex')}`);
    try {
      const body = await this.openRead(key);
      await pipeline(body, createWriteStream(path, { flags: 'wx', mode: 0o600 }));
      return await fn(path);
    } finally {
      await rm(path, { force: true });
    }
  }

  async check(): Promise<void> {
    try {
      await this.client.send(new HeadBucketCommand({ Bucket: this.bucket }));
    } catch (error) {
      const detail = error instanceof Error ? error.message || error.name : String(error);
      throw new Error(`the S3 bucket "${this.bucket}" cannot be reached: ${detail}`);
    }
  }

  destroy(): void {
    this.client.destroy();
  }

  toString(): string {
    return `S3 bucket ${this.bucket}`;
  }
}

import { UnsupportedMediaTypeException } from '@nestjs/common';
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { PassThrough, Readable } from 'node:stream';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { HashingDiskStorage, type HashedFileInfo } from './hashing-disk-storage';

function handle(engine: HashingDiskStorage, stream: Readable, originalname = 'clip.mp4'): Promise<HashedFileInfo> {
  const file = { fieldname: 'file', originalname, encoding: '7bit', mimetype: 'video/mp4', stream } as unknown as Express.Multer.File;
  return new Promise((resolve, reject) => {
    engine._handleFile({} as never, file, (error, info) => (error ? reject(error) : resolve(info as HashedFileInfo)));
  });
}

/** A stream of `total` pseudo-random bytes in chunks of `chunk`, as a socket would deliver them. */
function bytes(total: number, chunk = 16 * 1024): { stream: Readable; all: Buffer } {
  const all = Buffer.alloc(total);
  for (let i = 0; i < total; i++) all[i] = (i * 2654435761) >>> 24;
  const parts: Buffer[] = [];
  for (let i = 0; i < total; i += chunk) parts.push(all.subarray(i, i + chunk));
  return { stream: Readable.from(parts), all };
}

describe('HashingDiskStorage', () => {
  let dir: string;
  let inspected: Buffer[];
  beforeEach(() => {
    dir = join(mkdtempSync(join(tmpdir(), 'dialsheet-upload-')), 'tmp');
    inspected = [];
  });
  afterEach(() => rmSync(dirname(dir), { recursive: true, force: true }));

  const engine = (inspect: (head: Buffer) => Promise<string> = async () => 'video/mp4', headBytes = 4096) =>
    new HashingDiskStorage({
      directory: dir,
      headBytes,
      inspectHead: async (head) => {
        inspected.push(head);
        return inspect(head);
      },
    });

  it('writes the stream to a random name in its directory with the SHA-256 and size of every byte', async () => {
    const { stream, all } = bytes(300_000, 7_000);
    const info = await handle(engine(), stream, '../../etc/passwd');
    expect(info.sha256).toBe(createHash('sha256').update(all).digest('hex'));
    expect(info.size).toBe(all.length);
    expect(dirname(info.path)).toBe(dir);
    expect(info.filename).toMatch(/^upload-[0-9a-f]{32}$/);
    expect(info.path).not.toMatch(/passwd|\.\./);
    expect(readFileSync(info.path).equals(all)).toBe(true);
    expect(info.detectedType).toBe('video/mp4');
    // The check saw exactly the first headBytes bytes, once.
    expect(inspected).toHaveLength(1);
    expect(inspected[0].equals(all.subarray(0, 4096))).toBe(true);
  });

  it('checks a file shorter than the head at its end, and skips the check for an empty file', async () => {
    const short = await handle(engine(), Readable.from([Buffer.from('abc')]));
    expect(short.size).toBe(3);
    expect(inspected.map((b) => b.toString())).toEqual(['abc']);
    const empty = await handle(engine(), Readable.from([]));
    expect(empty).toMatchObject({ size: 0, detectedType: null, sha256: createHash('sha256').digest('hex') });
    expect(inspected).toHaveLength(1);
  });

  it('stops at a failed check and leaves no file', async () => {
    const { stream } = bytes(200_000);
    const refuse = async () => {
      throw new UnsupportedMediaTypeException('This file is not a video (found: text/plain)');
    };
    await expect(handle(engine(refuse), stream)).rejects.toThrow('This file is not a video (found: text/plain)');
    expect(readdirSync(dir)).toEqual([]);
  });

  it('removes the partial file when the connection breaks mid-way', async () => {
    const source = new PassThrough();
    const pending = handle(engine(), source);
    source.write(Buffer.alloc(100_000, 1));
    await new Promise((r) => setTimeout(r, 20));
    expect(readdirSync(dir)).toHaveLength(1);
    source.destroy(new Error('Request aborted'));
    await expect(pending).rejects.toThrow('Request aborted');
    expect(readdirSync(dir)).toEqual([]);
  });

  it('leaves no file when the connection breaks before the file is even open', async () => {
    const source = new PassThrough();
    const pending = handle(engine(), source);
    // At once, in the same tick: the file stream's open has not completed yet.
    source.destroy(new Error('Request aborted'));
    await expect(pending).rejects.toThrow('Request aborted');
    // Had the partial file been removed before its open completed, the open would create it now.
    await new Promise((r) => setTimeout(r, 50));
    expect(readdirSync(dir)).toEqual([]);
  });

  it('holds data back while the check runs (nothing past the head reaches the disk)', async () => {
    let release: (type: string) => void = () => undefined;
    const slow = () => new Promise<string>((resolve) => (release = resolve));
    const source = new PassThrough();
    const pending = handle(engine(slow, 1024), source);
    source.write(Buffer.alloc(64 * 1024, 2));
    await new Promise((r) => setTimeout(r, 30));
    const [name] = readdirSync(dir);
    expect(readFileSync(join(dir, name)).length).toBe(0);
    release('video/mp4');
    source.end();
    expect((await pending).size).toBe(64 * 1024);
  });

  it('_removeFile deletes what it stored and tolerates a file that is already gone', async () => {
    const e = engine();
    const info = await handle(e, Readable.from([Buffer.from('0123456789')]));
    const file = { ...info } as unknown as Express.Multer.File;
    await new Promise<void>((resolve, reject) => e._removeFile({} as never, file, (err) => (err ? reject(err) : resolve())));
    expect(readdirSync(dir)).toEqual([]);
    await new Promise<void>((resolve, reject) => e._removeFile({} as never, file, (err) => (err ? reject(err) : resolve())));
  });
});

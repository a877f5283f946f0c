import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { exactRange } from './s3-storage.driver';

const data = Buffer.from(Array.from({ length: 1000 }, (_, i) => i % 251));

async function collect(stream: Readable): Promise<Buffer> {
  const parts: Buffer[] = [];
  for await (const p of stream) parts.push(p as Buffer);
  return Buffer.concat(parts);
}

const chunks = (from: number) => Readable.from([data.subarray(from, from + 300), data.subarray(from + 300, from + 700), data.subarray(from + 700)]);

describe('exactRange', () => {
  it('passes an exact answer through unchanged', async () => {
    const body = Readable.from([data.subarray(100, 200)]);
    expect((await collect(exactRange(body, { start: 100, end: 199 }, 'bytes 100-199/1000'))).equals(data.subarray(100, 200))).toBe(true);
  });

  it('cuts an answer that runs past the end asked for (a store reading bytes=0-0 as 0-)', async () => {
    const out = await collect(exactRange(chunks(0), { start: 0, end: 0 }, 'bytes 0-999/1000'));
    expect(out.equals(data.subarray(0, 1))).toBe(true);
  });

  it('skips to the start when the store ignored Range and sent the whole object', async () => {
    const out = await collect(exactRange(chunks(0), { start: 250, end: 749 }, undefined));
    expect(out.equals(data.subarray(250, 750))).toBe(true);
  });

  it('refuses an answer that starts after the range', () => {
    expect(() => exactRange(chunks(500), { start: 100, end: 200 }, 'bytes 500-999/1000')).toThrow(/starting at 100/);
  });
});

import express from 'express';
import { randomBytes, randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AppConfig } from '../../../config/app-config';
import { LocalStorageDriver } from '../../../storage/local-storage.driver';
import { recordingKey } from '../../../storage/storage-keys';
import { StorageService } from '../../../storage/storage.service';
import { planRange, sendStoredObject } from './range-response';

const object = { size: 1000, etag: '"abc"', lastModified: new Date('2025-03-14T09:30:00Z') };

describe('planRange', () => {
  it.each([
    ['no Range header', {}, { status: 200, start: 0, end: 999 }],
    ['the first byte', { range: 'bytes=0-0' }, { status: 206, start: 0, end: 0 }],
    ['a middle slice', { range: 'bytes=100-199' }, { status: 206, start: 100, end: 199 }],
    ['an open end', { range: 'bytes=900-' }, { status: 206, start: 900, end: 999 }],
    ['the last 100 bytes', { range: 'bytes=-100' }, { status: 206, start: 900, end: 999 }],
    ['an end past the size (clamped)', { range: 'bytes=990-5000' }, { status: 206, start: 990, end: 999 }],
    ['the last byte only', { range: 'bytes=999-999' }, { status: 206, start: 999, end: 999 }],
    ['a start at the size', { range: 'bytes=1000-' }, { status: 416 }],
    ['a start past the end', { range: 'bytes=5000-6000' }, { status: 416 }],
    ['an empty suffix', { range: 'bytes=-0' }, { status: 416 }],
    ['end before start (refused like Express static does)', { range: 'bytes=500-100' }, { status: 416 }],
    ['garbage (ignored)', { range: 'bytes=abc' }, { status: 200, start: 0, end: 999 }],
    ['another unit (ignored)', { range: 'items=0-5' }, { status: 200, start: 0, end: 999 }],
    ['overlapping ranges, combined', { range: 'bytes=0-99,50-149' }, { status: 206, start: 0, end: 149 }],
    ['two separate ranges (whole file instead of multipart)', { range: 'bytes=0-9,500-509' }, { status: 200, start: 0, end: 999 }],
  ])('%s', (_label, headers, plan) => {
    expect(planRange(headers, object)).toEqual(plan);
  });

  it('answers 304 when If-None-Match holds the ETag (or *), before looking at Range', () => {
    expect(planRange({ ifNoneMatch: '"abc"', range: 'bytes=0-1' }, object)).toEqual({ status: 304 });
    expect(planRange({ ifNoneMatch: '"x", W/"abc"' }, object)).toEqual({ status: 304 });
    expect(planRange({ ifNoneMatch: '*' }, object)).toEqual({ status: 304 });
    expect(planRange({ ifNoneMatch: '"other"' }, object).status).toBe(200);
  });

  it('honours Range only while If-Range still describes this file', () => {
    expect(planRange({ range: 'bytes=0-9', ifRange: '"abc"' }, object)).toEqual({ status: 206, start: 0, end: 9 });
    expect(planRange({ range: 'bytes=0-9', ifRange: '"changed"' }, object)).toEqual({ status: 200, start: 0, end: 999 });
    expect(planRange({ range: 'bytes=0-9', ifRange: 'W/"abc"' }, object).status).toBe(200);
    expect(planRange({ range: 'bytes=0-9', ifRange: object.lastModified.toUTCString() }, object).status).toBe(206);
    expect(planRange({ range: 'bytes=0-9', ifRange: 'Thu, 13 Mar 2025 00:00:00 GMT' }, object).status).toBe(200);
  });

  it('treats any Range on an empty file as unsatisfiable', () => {
    expect(planRange({ range: 'bytes=0-' }, { ...object, size: 0 })).toEqual({ status: 416 });
  });
});

describe('sendStoredObject over HTTP', () => {
  let dir: string;
  let server: Server;
  const payload = randomBytes(200_000);
  const key = recordingKey(randomUUID(), 'proxy');

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'dialsheet-range-'));
    const storage = new StorageService({ storageDir: dir } as AppConfig, new LocalStorageDriver(join(dir, 'objects')));
    await storage.onModuleInit();
    const from = storage.tempPath('test');
    writeFileSync(from, payload);
    await storage.put(key, from);
    const stat = await storage.stat(key);
    const app = express();
    app.all('/media', (req, res, next) => {
      sendStoredObject(req, res, storage, { key, size: stat!.size, contentType: 'video/mp4', etag: '"v1"', lastModified: stat!.lastModified }, 'private, max-age=60').catch(next);
    });
    server = app.listen(0, '127.0.0.1');
  });
  afterAll(() => {
    server.close();
    rmSync(dir, { recursive: true, force: true });
  });

  const binary = (res: request.Response, cb: (err: Error | null, body: Buffer) => void) => {
    const parts: Buffer[] = [];
    res.on('data', (c: Buffer) => parts.push(c));
    res.on('end', () => cb(null, Buffer.concat(parts)));
  };

  it('sends the whole file with the headers a <video> element relies on', async () => {
    const res = await request(server).get('/media').buffer(true).parse(binary);
    expect(res.status).toBe(200);
    expect(res.headers).toMatchObject({
      'accept-ranges': 'bytes',
      'content-type': 'video/mp4',
      'content-length': String(payload.length),
      etag: '"v1"',
      'cache-control': 'private, max-age=60',
    });
    expect(res.headers['last-modified']).toMatch(/GMT$/);
    expect((res.body as Buffer).equals(payload)).toBe(true);
  });

  it('sends 206 with Content-Range for one range, byte-exact', async () => {
    const res = await request(server).get('/media').set('Range', 'bytes=1000-1999').buffer(true).parse(binary);
    expect(res.status).toBe(206);
    expect(res.headers['content-range']).toBe(`bytes 1000-1999/${payload.length}`);
    expect(res.headers['content-length']).toBe('1000');
    expect((res.body as Buffer).equals(payload.subarray(1000, 2000))).toBe(true);
    const tail = await request(server).get('/media').set('Range', 'bytes=-10').buffer(true).parse(binary);
    expect((tail.body as Buffer).equals(payload.subarray(payload.length - 10))).toBe(true);
  });

  it('sends 416 with bytes */size past the end, and a message', async () => {
    const res = await request(server).get('/media').set('Range', `bytes=${payload.length}-`);
    expect(res.status).toBe(416);
    expect(res.headers['content-range']).toBe(`bytes */${payload.length}`);
    expect(res.body).toEqual({
      statusCode: 416,
      error: 'Range Not Satisfiable',
      message: `The requested range is outside the file, which has ${payload.length} bytes`,
    });
  });

  it('answers HEAD with the same headers and no body', async () => {
    const res = await request(server).head('/media').set('Range', 'bytes=0-99');
    expect(res.status).toBe(206);
    expect(res.headers['content-length']).toBe('100');
    expect(res.headers['content-range']).toBe(`bytes 0-99/${payload.length}`);
    expect(res.text ?? '').toBe('');
  });

  it('answers 304 to a revalidation with the current ETag', async () => {
    const res = await request(server).get('/media').set('If-None-Match', '"v1"');
    expect(res.status).toBe(304);
    expect(res.headers.etag).toBe('"v1"');
  });
});

import type { MediaUrls, Recording } from '@dialsheet/common';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordingKey } from '../../src/storage/storage-keys';
import { StorageService } from '../../src/storage/storage.service';
import { startFakeS3, type FakeS3 } from '../helpers/fake-s3';
import { TestMedia } from '../helpers/media';
import { binary, campaignFixture, createRun, filesUnder, upload, waitForStatus, type Fixture } from '../helpers/recordings';
import { bearer, startTestApp, type TestApp } from '../helpers/test-app';


describe('recordings in an S3 bucket (fake S3 on 127.0.0.1)', () => {
  let s3: FakeS3;
  let t: TestApp;
  let f: Fixture;
  const media = new TestMedia();

  beforeAll(async () => {
    s3 = await startFakeS3();
    t = await startTestApp({ env: s3.env });
    f = await campaignFixture(t);
  });
  afterAll(async () => {
    await t.close();
    await s3.stop();
    media.remove();
  });

  it('uploads, processes from the bucket, streams ranges and deletes the objects', async () => {
    const storage = t.app.get(StorageService);
    expect(storage.driverName).toBe('s3');
    const run = await createRun(t.http, f.tokens.lead, f.campaign.id);
    const clip = await media.unique(media.clip());
    const res = await upload(t.http, f.tokens.lead, run.id, clip);
    expect(res.status).toBe(201);
    const rec = await waitForStatus(t.http, f.tokens.reader, run.id);
    expect(rec).toMatchObject({ id: (res.body as Recording).id, status: 'ready', proxy: { width: 320, height: 240 } });

    // Nothing on local disk but scratch space, which is empty again.
    expect(filesUnder(join(t.config.storageDir, 'objects'))).toEqual([]);
    expect(filesUnder(join(t.config.storageDir, 'tmp'))).toEqual([]);
    for (const object of ['original', 'proxy', 'poster'] as const) {
      expect(await storage.stat(recordingKey(rec.id, object)), object).not.toBeNull();
    }
    expect((await storage.stat(recordingKey(rec.id, 'original')))?.size).toBe(readFileSync(clip).length);

    const urls = (await t.http.post(`/api/recordings/${rec.id}/media-urls`).set(bearer(f.tokens.reader))).body as MediaUrls;
    const whole = await t.http.get(urls.proxyUrl as string).buffer(true).parse(binary);
    expect(whole.status).toBe(200);
    expect((whole.body as Buffer).length).toBe(rec.proxy?.sizeBytes);
    for (const [start, end] of [
      [0, 0],
      [0, 1],
      [500, 1499],
    ]) {
      const part = await t.http.get(urls.proxyUrl as string).set('Range', `bytes=${start}-${end}`).buffer(true).parse(binary);
      expect(part.status).toBe(206);
      expect(part.headers['content-range']).toBe(`bytes ${start}-${end}/${rec.proxy?.sizeBytes}`);
      expect((part.body as Buffer).equals((whole.body as Buffer).subarray(start, end + 1))).toBe(true);
    }
    const past = await t.http.get(urls.proxyUrl as string).set('Range', `bytes=${(rec.proxy?.sizeBytes ?? 0) + 1}-`);
    expect(past.status).toBe(416);
    const original = await t.http.get(urls.originalUrl).buffer(true).parse(binary);
    expect(createHash('sha256').update(original.body as Buffer).digest('hex')).toBe(rec.sha256);

    expect((await t.http.delete(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.lead))).status).toBe(204);
    for (const object of ['original', 'proxy', 'poster'] as const) {
      expect(await storage.stat(recordingKey(rec.id, object)), object).toBeNull();
    }
  });
});

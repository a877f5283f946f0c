import type { AuditEntry, MediaUrls, Page, Recording, RecordingFrames, Run } from '@dialsheet/common';
import { createHash, randomUUID } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { request as httpRequest, type Server } from 'node:http';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { IDLE_SOCKET_TIMEOUT_MS } from '../../src/app.factory';
import { MediaUrlSigner } from '../../src/modules/recordings/media/media-url-signer';
import { TestMedia } from '../helpers/media';
import {
  binary,
  campaignFixture,
  createRun,
  filesUnder,
  listeningPort,
  MEMBERS,
  recordingRows,
  upload,
  VIEWERS,
  waitForStatus,
  type Fixture,
} from '../helpers/recordings';
import { bearer, startTestApp, type TestApp } from '../helpers/test-app';

/** Small on purpose, so the over-limit case is cheap; every test clip is far below it. */
const LIMIT = 2 * 1024 * 1024;

const sha256 = (path: string) => createHash('sha256').update(readFileSync(path)).digest('hex');


describe('recordings', () => {
  let t: TestApp;
  let f: Fixture;
  const media = new TestMedia();
  let tmpDir: string;
  let objectsDir: string;

  beforeAll(async () => {
    t = await startTestApp({ env: { UPLOAD_MAX_BYTES: String(LIMIT) } });
    tmpDir = join(t.config.storageDir, 'tmp');
    objectsDir = join(t.config.storageDir, 'objects');
    f = await campaignFixture(t);
    // Made once up front, so upload tests time the server rather than ffmpeg.
    await Promise.all([media.clip(), media.camera(), media.vfr()]);
  });
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  const get = (path: string, token = f.tokens.reader) => t.http.get(path).set(bearer(token));
  const mediaUrls = async (recordingId: string, token = f.tokens.reader) => {
    const res = await t.http.post(`/api/recordings/${recordingId}/media-urls`).set(bearer(token));
    expect(res.status).toBe(200);
    return res.body as MediaUrls;
  };

  describe('upload and processing', () => {
    let run: Run;
    let ready: Recording;
    let clipPath: string;

    beforeAll(async () => {
      run = await createRun(t.http, f.tokens.engineer, f.campaign.id, 'Run 1 — meter on warm stream');
      clipPath = await media.unique(media.clip(), 'GoPro clip (1).mp4');
      const res = await upload(t.http, f.tokens.engineer, run.id, clipPath);
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      expect(res.body).toMatchObject({
        runId: run.id,
        originalName: 'GoPro clip (1).mp4',
        sizeBytes: statSync(clipPath).size,
        sha256: sha256(clipPath),
        mimeType: 'video/mp4',
        status: 'uploaded',
        failureReason: null,
        uploadedBy: f.users.engineer.id,
      });
      ready = await waitForStatus(t.http, f.tokens.reader, run.id);
    });

    it('ends ready with the probe, a proxy and the frame times', async () => {
      expect(ready).toMatchObject({ status: 'ready', progress: 100, failureReason: null });
      expect(ready.probe).toMatchObject({
        durationSec: 2,
        width: 320,
        height: 240,
        displayWidth: 320,
        displayHeight: 240,
        rotation: 0,
        codec: 'h264',
        pixelFormat: 'yuv420p',
        nominalFps: 30,
        averageFps: 30,
        variableFrameRate: false,
        frameCount: 60,
      });
      // Not enlarged: the proxy keeps a source smaller than 720 lines as it is.
      expect(ready.proxy).toEqual({ width: 320, height: 240, sizeBytes: expect.any(Number) });
      const frames = await get(`/api/recordings/${ready.id}/frames`);
      expect(frames.status).toBe(200);
      const body = frames.body as RecordingFrames;
      expect(body.recordingId).toBe(ready.id);
      expect(body.times).toHaveLength(60);
      body.times.forEach((time, k) => expect(time).toBeCloseTo(k / 30, 5));
      // One keyframe a second in the proxy.
      expect(body.keyframeTimes).toEqual([0, 1]);
      const listed = await get(`/api/campaigns/${f.campaign.id}/runs`);
      expect((listed.body as Run[]).find((r) => r.id === run.id)?.recording).toEqual(ready);
    });

    it('keeps the original byte for byte and nothing in tmp', async () => {
      const urls = await mediaUrls(ready.id);
      const original = await t.http.get(urls.originalUrl).buffer(true).parse(binary);
      expect(original.status).toBe(200);
      expect(original.headers['content-type']).toBe('video/mp4');
      expect(original.headers.etag).toBe(`"${sha256(clipPath)}"`);
      expect(createHash('sha256').update(original.body as Buffer).digest('hex')).toBe(ready.sha256);
      expect(filesUnder(tmpDir)).toEqual([]);
      expect(filesUnder(join(objectsDir, 'recordings', ready.id))).toEqual(['original', 'poster.jpg', 'proxy.mp4']);
    });

    it('streams the proxy with ranges, HEAD, ETag and private caching', async () => {
      const urls = await mediaUrls(ready.id);
      expect(urls.proxyUrl).toMatch(new RegExp(`^/api/media/${ready.id}/proxy\\?exp=\\d+&sig=`));
      expect(Date.parse(urls.expiresAt) - Date.now()).toBeGreaterThan(14 * 60 * 1000);
      const proxyUrl = urls.proxyUrl as string;
      const whole = await t.http.get(proxyUrl).buffer(true).parse(binary);
      expect(whole.status).toBe(200);
      expect(whole.headers).toMatchObject({ 'content-type': 'video/mp4', 'accept-ranges': 'bytes' });
      expect(whole.headers['cache-control']).toMatch(/^private, max-age=\d+$/);
      const size = (whole.body as Buffer).length;
      expect(size).toBe(ready.proxy?.sizeBytes);

      const part = await t.http.get(proxyUrl).set('Range', 'bytes=100-199').buffer(true).parse(binary);
      expect(part.status).toBe(206);
      expect(part.headers['content-range']).toBe(`bytes 100-199/${size}`);
      expect((part.body as Buffer).equals((whole.body as Buffer).subarray(100, 200))).toBe(true);

      const head = await t.http.head(proxyUrl);
      expect(head.status).toBe(200);
      expect(head.headers['content-length']).toBe(String(size));
      expect(head.headers.etag).toBe(whole.headers.etag);

      const past = await t.http.get(proxyUrl).set('Range', `bytes=${size + 10}-`);
      expect(past.status).toBe(416);
      expect(past.headers['content-range']).toBe(`bytes */${size}`);
      expect(past.body.message).toBe(`The requested range is outside the file, which has ${size} bytes`);

      const again = await t.http.get(proxyUrl).set('If-None-Match', whole.headers.etag as string);
      expect(again.status).toBe(304);

      const poster = await t.http.get(urls.posterUrl as string).buffer(true).parse(binary);
      expect(poster.status).toBe(200);
      expect(poster.headers['content-type']).toBe('image/jpeg');
      expect((poster.body as Buffer).subarray(0, 2).toString('hex')).toBe('ffd8');
    });

    it('refuses expired, tampered and foreign links with 403 and a clear message', async () => {
      const signer = new MediaUrlSigner(t.config.jwtSecret);
      const expired = await t.http.get(signer.url(ready.id, 'proxy', Math.floor(Date.now() / 1000) - 5));
      expect(expired.status).toBe(403);
      expect(expired.body).toEqual({ statusCode: 403, error: 'Forbidden', message: 'This media link has expired' });

      const urls = await mediaUrls(ready.id);
      const proxyUrl = urls.proxyUrl as string;
      const longer = proxyUrl.replace(/exp=(\d+)/, (_m, exp: string) => `exp=${Number(exp) + 86400}`);
      expect((await t.http.get(longer)).body.message).toBe('This media link is not valid');
      const forged = proxyUrl.replace(/sig=(.)/, (_m, c: string) => `sig=${c === 'A' ? 'B' : 'A'}`);
      expect((await t.http.get(forged)).status).toBe(403);
      expect((await t.http.get(proxyUrl.replace('/proxy?', '/original?'))).status).toBe(403);
      expect((await t.http.get(proxyUrl.split('?')[0])).body.message).toBe('This media link is not valid');
      expect((await t.http.head(forged)).status).toBe(403);

      // A link for this recording never opens another one (here: one in another campaign).
      const other = await campaignFixture(t, 'Another bench');
      const otherRun = await createRun(t.http, other.tokens.lead, other.campaign.id);
      const otherUpload = await upload(t.http, other.tokens.lead, otherRun.id, await media.unique(media.clip()));
      expect(otherUpload.status).toBe(201);
      const foreign = proxyUrl.replace(ready.id, (otherUpload.body as Recording).id);
      const res = await t.http.get(foreign);
      expect(res.status).toBe(403);
      expect(res.body.message).toBe('This media link is not valid');
      await waitForStatus(t.http, other.tokens.lead, otherRun.id);
    });

    it('lets members of the campaign only ask for frames and links', async () => {
      for (const actor of MEMBERS) {
        expect((await get(`/api/recordings/${ready.id}/frames`, f.tokens[actor])).status, actor).toBe(200);
        expect((await get(`/api/runs/${run.id}/recording`, f.tokens[actor])).status, actor).toBe(200);
        const links = await t.http.post(`/api/recordings/${ready.id}/media-urls`).set(bearer(f.tokens[actor]));
        expect(links.status, actor).toBe(200);
      }
      for (const path of [`/api/recordings/${ready.id}/frames`, `/api/recordings/${randomUUID()}/frames`]) {
        const res = await get(path, f.tokens.outsider);
        expect(res.status).toBe(404);
        expect(res.body.message).toBe('Recording not found');
      }
      expect((await t.http.post(`/api/recordings/${ready.id}/media-urls`).set(bearer(f.tokens.outsider))).status).toBe(404);
      expect((await t.http.get(`/api/recordings/${ready.id}/frames`)).status).toBe(401);
      expect((await t.http.post(`/api/recordings/${ready.id}/media-urls`)).status).toBe(401);
    });

    it('records the upload in the audit trail', async () => {
      const audit = await get(`/api/campaigns/${f.campaign.id}/audit?entityType=recording&action=create`, f.tokens.lead);
      const entry = (audit.body as Page<AuditEntry>).items.find((e) => e.entityId === ready.id);
      expect(entry).toMatchObject({
        actorId: f.users.engineer.id,
        after: { runId: run.id, runName: run.name, originalName: 'GoPro clip (1).mp4', sha256: ready.sha256, sizeBytes: ready.sizeBytes },
      });
    });

    it('refuses the same file again in this campaign with a link to its run (409)', async () => {
      const second = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Run 3 — repeat');
      const res = await upload(t.http, f.tokens.lead, second.id, clipPath);
      expect(res.status).toBe(409);
      expect(res.body).toEqual({
        statusCode: 409,
        error: 'Conflict',
        message: `This file is already the recording of run ${run.name}`,
        duplicateOf: { runId: run.id, runName: run.name, recordingId: ready.id },
      });
      expect(await recordingRows(t, second.id)).toBe(0);
      expect(filesUnder(tmpDir)).toEqual([]);
    });
  });

  describe('frame timing of camera and phone footage', () => {
    it('probes a camera-style file with a 10 s keyframe interval and gives its proxy one keyframe a second', async () => {
      const run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Camera');
      expect((await upload(t.http, f.tokens.lead, run.id, await media.unique(media.camera()))).status).toBe(201);
      const rec = await waitForStatus(t.http, f.tokens.lead, run.id);
      expect(rec.status).toBe('ready');
      expect(rec.probe).toMatchObject({ keyframeCount: 1, maxKeyframeInterval: 3, frameCount: 90 });
      const frames = (await get(`/api/recordings/${rec.id}/frames`)).body as RecordingFrames;
      expect(frames.keyframeTimes).toEqual([0, 1, 2]);
    });

    it('keeps the real presentation times of a variable-frame-rate file', async () => {
      const run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Phone');
      expect((await upload(t.http, f.tokens.lead, run.id, await media.unique(media.vfr()))).status).toBe(201);
      const rec = await waitForStatus(t.http, f.tokens.lead, run.id);
      expect(rec.status).toBe('ready');
      expect(rec.probe?.variableFrameRate).toBe(true);
      const frames = (await get(`/api/recordings/${rec.id}/frames`)).body as RecordingFrames;
      expect(frames.times).toHaveLength(rec.probe?.frameCount as number);
      const gaps = frames.times.slice(1).map((time, i) => time - frames.times[i]);
      expect(Math.min(...gaps)).toBeCloseTo(1 / 30, 4);
      expect(Math.max(...gaps)).toBeCloseTo(2 / 30, 4);
    });
  });

  describe('bad input', () => {
    let run: Run;
    beforeAll(async () => {
      run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Bad input');
    });

    const expectNothingStored = async () => {
      expect(await recordingRows(t, run.id)).toBe(0);
      expect(filesUnder(tmpDir)).toEqual([]);
    };

    it('a renamed text file → 415 naming what it is', async () => {
      const text = media.file('readings.mp4', 'time,T1,T2,T3,T4\n0,40.1,25.3,18.0,31.2\n'.repeat(2000));
      const res = await upload(t.http, f.tokens.lead, run.id, text);
      expect(res.status).toBe(415);
      expect(res.body).toEqual({ statusCode: 415, error: 'Unsupported Media Type', message: 'This file is not a video (found: text/plain)' });
      const png = media.file('still.mp4', Buffer.concat([Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex'), Buffer.alloc(200)]));
      expect((await upload(t.http, f.tokens.lead, run.id, png)).body.message).toBe('This file is not a video (found: image/png)');
      await expectNothingStored();
    });

    it('a zero-byte file and a form without the file → 400', async () => {
      const empty = await upload(t.http, f.tokens.lead, run.id, media.file('empty.mp4', ''));
      expect(empty.status).toBe(400);
      expect(empty.body.message).toBe('The file is empty (0 bytes)');
      const none = await t.http.post(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.lead)).field('note', 'no file');
      expect(none.status).toBe(400);
      expect(none.body.message).toBe('Choose a video file to upload in the form field "file"');
      const wrongField = await upload(t.http, f.tokens.lead, run.id, await media.clip(), 'video');
      expect(wrongField.status).toBe(400);
      expect(wrongField.body.message).toBe('Send the video in the form field "file" (got "video")');
      await expectNothingStored();
    });

    it('a file over UPLOAD_MAX_BYTES → 413 stating the limit', async () => {
      // Just over: the declared length passes the early check, so multer's own limit stops it.
      const res = await upload(t.http, f.tokens.lead, run.id, await media.oversized(LIMIT + 10_000));
      expect(res.status).toBe(413);
      expect(res.body.message).toBe('The file is larger than the limit of 2 MB');
      await expectNothingStored();
    });

    it('a declared Content-Length over the limit → 413 before any byte is read', async () => {
      const port = await listeningPort(t);
      const answer = await new Promise<{ status: number; body: string }>((resolve, reject) => {
        const req = httpRequest(
          {
            host: '127.0.0.1',
            port,
            method: 'POST',
            path: `/api/runs/${run.id}/recording`,
            headers: {
              ...bearer(f.tokens.lead),
              'Content-Type': 'multipart/form-data; boundary=xyz',
              'Content-Length': String(50 * 1024 * 1024),
            },
          },
          (res) => {
            let body = '';
            res.on('data', (c: Buffer) => (body += c.toString()));
            res.on('end', () => {
              req.destroy();
              resolve({ status: res.statusCode ?? 0, body });
            });
          },
        );
        req.on('error', reject);
        req.write('--xyz\r\nContent-Disposition: form-data; name="file"; filename="big.mp4"\r\n\r\n');
      });
      expect(answer.status).toBe(413);
      expect(JSON.parse(answer.body).message).toBe('The file is larger than the limit of 2 MB');
      await expectNothingStored();
    });

    it('a truncated MP4 is accepted by its type, then fails with a reason in words', async () => {
      const res = await upload(t.http, f.tokens.lead, run.id, await media.truncated());
      expect(res.status).toBe(201);
      const failed = await waitForStatus(t.http, f.tokens.lead, run.id);
      expect(failed).toMatchObject({
        status: 'failed',
        failureReason: 'The video could not be read: the file is damaged or incomplete.',
        probe: null,
        proxy: null,
      });
      const frames = await get(`/api/recordings/${failed.id}/frames`);
      expect(frames.status).toBe(409);
      expect(frames.body.message).toBe('This recording failed to process, so it has no frame times');
      const urls = await mediaUrls(failed.id);
      expect(urls.proxyUrl).toBeNull();
      expect(urls.posterUrl).toBeNull();
      // Failing processing leaves the original exactly as uploaded.
      expect((await t.http.head(urls.originalUrl)).headers['content-length']).toBe(String(failed.sizeBytes));
      expect((await t.http.delete(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.lead))).status).toBe(204);
    });

    it('an upload by a reader or checker → 403 before the body is read', async () => {
      for (const actor of VIEWERS) {
        const res = await upload(t.http, f.tokens[actor], run.id, await media.clip());
        expect(res.status, actor).toBe(403);
        expect(res.body.message).toBe('This needs the Lead or Engineer role in this campaign');
      }
      // A large body that has barely begun: the answer comes at once, and no temporary file was
      // ever opened for it.
      const port = await listeningPort(t);
      const answer = await new Promise<number>((resolve, reject) => {
        const req = httpRequest(
          {
            host: '127.0.0.1',
            port,
            method: 'POST',
            path: `/api/runs/${run.id}/recording`,
            headers: {
              ...bearer(f.tokens.reader),
              'Content-Type': 'multipart/form-data; boundary=xyz',
              'Content-Length': String(200 * 1024 * 1024),
            },
          },
          (res) => {
            expect(filesUnder(tmpDir)).toEqual([]);
            res.resume();
            res.on('end', () => {
              req.destroy();
              resolve(res.statusCode ?? 0);
            });
          },
        );
        req.on('error', reject);
        req.write('--xyz\r\nContent-Disposition: form-data; name="file"; filename="clip.mp4"\r\n\r\n');
        req.write(readFileSync(media.file('head.bin', Buffer.alloc(1000, 1))));
      });
      expect(answer).toBe(403);
      const stranger = await upload(t.http, f.tokens.outsider, run.id, await media.clip());
      expect(stranger.status).toBe(404);
      expect((await t.http.post(`/api/runs/${run.id}/recording`).attach('file', await media.clip())).status).toBe(401);
      await expectNothingStored();
    });

    it('lets a long upload take as long as it needs, as long as bytes keep coming', () => {
      const server = t.app.getHttpServer() as Server;
      expect(server.requestTimeout).toBe(0);
      expect(server.timeout).toBe(IDLE_SOCKET_TIMEOUT_MS);
      expect(server.headersTimeout).toBeGreaterThan(0);
    });

    it('an upload cut off half-way leaves no file and no row', async () => {
      const port = await listeningPort(t);
      const video = readFileSync(await media.unique(media.clip()));
      const head = Buffer.from('--xyz\r\nContent-Disposition: form-data; name="file"; filename="clip.mp4"\r\nContent-Type: video/mp4\r\n\r\n');
      const tail = Buffer.from('\r\n--xyz--\r\n');
      await new Promise<void>((resolve) => {
        const req = httpRequest({
          host: '127.0.0.1',
          port,
          method: 'POST',
          path: `/api/runs/${run.id}/recording`,
          headers: {
            ...bearer(f.tokens.lead),
            'Content-Type': 'multipart/form-data; boundary=xyz',
            'Content-Length': String(head.length + video.length + tail.length),
          },
        });
        req.on('error', () => resolve());
        req.write(head);
        req.write(video.subarray(0, Math.floor(video.length / 2)), () => {
          // Let the server start writing the temporary file, then drop the connection.
          setTimeout(() => {
            expect(filesUnder(tmpDir)).toHaveLength(1);
            req.destroy();
            resolve();
          }, 300);
        });
      });
      const deadline = Date.now() + 5000;
      while (filesUnder(tmpDir).length > 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
      await expectNothingStored();
    });
  });

  describe('replace, delete and sync', () => {
    it('replaces the recording while no reading exists; the old files go, both steps are audited', async () => {
      const run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Replace me');
      const first = (await upload(t.http, f.tokens.lead, run.id, await media.unique(media.clip()))).body as Recording;
      await waitForStatus(t.http, f.tokens.lead, run.id);
      expect(filesUnder(join(objectsDir, 'recordings', first.id))).toEqual(['original', 'poster.jpg', 'proxy.mp4']);
      const res = await upload(t.http, f.tokens.engineer, run.id, await media.unique(media.camera()));
      expect(res.status).toBe(201);
      const second = res.body as Recording;
      expect(second.id).not.toBe(first.id);
      expect(filesUnder(join(objectsDir, 'recordings', first.id))).toEqual([]);
      expect((await get(`/api/recordings/${first.id}/frames`)).status).toBe(404);
      expect(await recordingRows(t, run.id)).toBe(1);
      const ready = await waitForStatus(t.http, f.tokens.lead, run.id);
      expect(ready).toMatchObject({ id: second.id, status: 'ready' });
      const audit = (await get(`/api/campaigns/${f.campaign.id}/audit?entityType=recording`, f.tokens.lead)).body as Page<AuditEntry>;
      const mine = audit.items.filter((e) => e.entityId === first.id || e.entityId === second.id);
      expect(mine.map((e) => [e.entityId, e.action])).toEqual([
        [second.id, 'create'],
        [first.id, 'delete'],
        [first.id, 'create'],
      ]);
      expect(mine[0].after).toMatchObject({ replaces: first.id });
      expect(mine[1]).toMatchObject({ actorId: f.users.engineer.id, reason: 'Replaced by a new upload', before: { sha256: first.sha256 } });
    });

    it('deletes a recording (its files too) for writers only; deleting the run removes the rest', async () => {
      const run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Delete me');
      const rec = (await upload(t.http, f.tokens.lead, run.id, await media.unique(media.clip()))).body as Recording;
      await waitForStatus(t.http, f.tokens.lead, run.id);
      for (const actor of VIEWERS) {
        expect((await t.http.delete(`/api/runs/${run.id}/recording`).set(bearer(f.tokens[actor]))).status).toBe(403);
      }
      expect((await t.http.delete(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.engineer))).status).toBe(204);
      expect(filesUnder(join(objectsDir, 'recordings', rec.id))).toEqual([]);
      const gone = await get(`/api/runs/${run.id}/recording`);
      expect(gone.status).toBe(404);
      expect(gone.body.message).toBe('This run has no recording yet');
      expect((await t.http.delete(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.engineer))).status).toBe(404);
      const audit = (await get(`/api/campaigns/${f.campaign.id}/audit?entityType=recording&action=delete`, f.tokens.lead)).body as Page<AuditEntry>;
      expect(audit.items.find((e) => e.entityId === rec.id)).toMatchObject({ actorId: f.users.engineer.id, before: { sha256: rec.sha256 } });

      const again = (await upload(t.http, f.tokens.lead, run.id, await media.unique(media.clip()))).body as Recording;
      await waitForStatus(t.http, f.tokens.lead, run.id);
      expect((await t.http.delete(`/api/runs/${run.id}`).set(bearer(f.tokens.lead))).status).toBe(204);
      expect(filesUnder(join(objectsDir, 'recordings', again.id))).toEqual([]);
      expect(await recordingRows(t, run.id)).toBe(0);
    });

    it('sets sync marks checked by the common rules, with the change audited', async () => {
      const run = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Sync');
      const put = (body: unknown, token = f.tokens.engineer) => t.http.put(`/api/runs/${run.id}/sync`).set(bearer(token)).send(body as object);
      const early = await put({ first: { videoTime: 0.5, testTime: 0 } });
      expect(early.status).toBe(409);
      expect(early.body.message).toBe('Upload the recording of this run before marking its sync frames');
      await upload(t.http, f.tokens.lead, run.id, await media.unique(media.clip()));
      await waitForStatus(t.http, f.tokens.lead, run.id);

      const ok = await put({ first: { videoTime: 0.5, testTime: 0 }, reason: 'lamp lit on frame 15' });
      expect(ok.status).toBe(200);
      expect((ok.body as Run).sync).toEqual({ first: { videoTime: 0.5, testTime: 0 } });
      const two = await put({ first: { videoTime: 0.5, testTime: 0 }, second: { videoTime: 1.9, testTime: 1.4001 } });
      expect(two.status).toBe(200);
      expect((two.body as Run).sync?.second).toEqual({ videoTime: 1.9, testTime: 1.4001 });

      const cases: Array<[unknown, string]> = [
        [{}, 'first is required: the start-marker frame and its test time'],
        [{ first: { videoTime: 'x', testTime: 0 } }, 'first.videoTime must be a number of seconds'],
        [{ first: { videoTime: -1, testTime: 0 } }, 'first.videoTime must not be negative'],
        [
          { first: { videoTime: 1.5, testTime: 0 }, second: { videoTime: 1.0, testTime: 2 } },
          'the second sync mark must be later in the video than the first (video 1 s is not after 1.5 s)',
        ],
        [{ first: { videoTime: 0.5, testTime: 0 }, second: { videoTime: 1.5, testTime: 5 } }, 'test seconds per video second'],
        [{ first: { videoTime: 30, testTime: 0 } }, 'first.videoTime must lie within the video (0–2.000 s), got 30 s'],
      ];
      for (const [body, message] of cases) {
        const res = await put(body);
        expect(res.status, JSON.stringify(body)).toBe(400);
        expect(JSON.stringify(res.body.message)).toContain(message.replace(/"/g, '\\"'));
      }
      expect((await get(`/api/runs/${run.id}`)).body.sync.second).toEqual({ videoTime: 1.9, testTime: 1.4001 });

      const audit = (await get(`/api/campaigns/${f.campaign.id}/audit?entityType=run&action=update`, f.tokens.lead)).body as Page<AuditEntry>;
      const syncRows = audit.items.filter((e) => e.entityId === run.id);
      expect(syncRows).toHaveLength(2);
      expect(syncRows[1]).toMatchObject({ before: { sync: null }, after: { sync: { first: { videoTime: 0.5, testTime: 0 } } }, reason: 'lamp lit on frame 15' });
      expect(syncRows[0].before).toEqual({ sync: { first: { videoTime: 0.5, testTime: 0 } } });

      // Removing the recording drops its marks with it: they pointed into that video.
      await t.http.delete(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.lead));
      expect((await get(`/api/runs/${run.id}`)).body.sync).toBeNull();
    });
  });
});

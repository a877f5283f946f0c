import type { Recording } from '@dialsheet/common';
import { execFile } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STORAGE_FULL } from '../../src/core/filters/all-exceptions.filter';
import { DAMAGED } from '../../src/modules/recordings/media/failure-reasons';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createRun, filesUnder, recordingRows, upload, waitForStatus, type Fixture } from '../helpers/recordings';
import { scratchDir, startTestApp, type TestApp } from '../helpers/test-app';

// Fault drills of issue 7 that the recordings tests do not already cover:
// - a disk that really fills up (ENOSPC) while an upload is written, and while it is moved into
//   storage; the upload limit hit mid-upload (413) and an upload cut off are in recordings.e2e-spec.ts;
// - corrupt videos beyond the truncated one there: random bytes behind a real MP4 header, and a
//   header alone; each fails in words and the worker goes straight on with the next upload.
// A zero-byte upload is refused with 400 before anything is stored (recordings.e2e-spec.ts).

const run = promisify(execFile);

/**
 * A full disk for real: a small tmpfs mounted at `dir`. Mounting needs root (and a kernel that
 * lets this process mount); elsewhere the drill is skipped with the reason printed. A tmpfs is the
 * portable way to get a true ENOSPC from the kernel, through the same fs calls as production,
 * without filling the machine's disk or faking an error inside the code under test.
 */
async function mountSmallDisk(dir: string, size: string): Promise<string | null> {
  if (process.getuid?.() !== 0) return 'not running as root, so no tmpfs can be mounted';
  mkdirSync(dir, { recursive: true });
  try {
    await run('mount', ['-t', 'tmpfs', '-o', `size=${size},mode=0700`, 'tmpfs', dir]);
    return null;
  } catch (error) {
    return `mount -t tmpfs failed: ${(error as { stderr?: string }).stderr?.trim() || String(error)}`;
  }
}

/** Upload and recording files under a storage directory (tmp/ and objects/; the JWT secret beside them is not one). */
function stored(storageDir: string): string[] {
  return ['tmp', 'objects'].flatMap((sub) => filesUnder(join(storageDir, sub)).map((file) => `${sub}/${file}`));
}

async function unmount(dir: string): Promise<void> {
  await run('umount', [dir]).catch(() => undefined);
}

describe('a full disk mid-upload', () => {
  const media = new TestMedia();
  const mounts: string[] = [];
  const apps: TestApp[] = [];
  const probe = scratchDir('full-disk-probe');
  let skipReason: string | null = null;

  beforeAll(async () => {
    skipReason = await mountSmallDisk(probe, '64k');
    if (skipReason) console.warn(`full-disk drill skipped: ${skipReason}`);
    else mounts.push(probe);
    await media.clip();
  });
  afterAll(async () => {
    for (const t of apps) await t.close();
    for (const dir of mounts) await unmount(dir);
    media.remove();
  });

  const startOn = async (storageDir: string) => {
    // No worker: processing would write into the storage directory while the test looks at it.
    const t = await startTestApp({ env: { UPLOAD_MAX_BYTES: String(8 * 1024 * 1024), WORKER: 'off' }, overrides: { storageDir } });
    apps.push(t);
    return t;
  };

  it('the whole storage directory full while the upload is written → 507 in words, nothing left, and room again after', async (ctx) => {
    if (skipReason) ctx.skip();
    const storageDir = scratchDir('full-disk');
    expect(await mountSmallDisk(storageDir, '1m')).toBeNull();
    mounts.push(storageDir);
    const t = await startOn(storageDir);
    const f: Fixture = await campaignFixture(t);
    const target = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Full disk');

    // 3 MB (a real MP4 head, then filler): under the upload limit, three times the free space.
    const res = await upload(t.http, f.tokens.lead, target.id, await media.oversized(3 * 1024 * 1024));
    expect(res.status).toBe(507);
    expect(res.body).toEqual({ statusCode: 507, error: 'Insufficient Storage', message: STORAGE_FULL });
    expect(await recordingRows(t, target.id)).toBe(0);
    // The partial temporary file went with the error: nothing in tmp/ or objects/.
    expect(stored(storageDir)).toEqual([]);

    // Since nothing was left behind, a file that fits goes through on the same disk.
    const ok = await upload(t.http, f.tokens.lead, target.id, await media.unique(media.clip()));
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    expect(await recordingRows(t, target.id)).toBe(1);
    expect(stored(storageDir)).toEqual([`objects/recordings/${(ok.body as Recording).id}/original`]);
  }, 90_000);

  it('the object store full while the finished upload is moved in → 507, no half-copied object, no temp file, no row', async (ctx) => {
    if (skipReason) ctx.skip();
    const storageDir = scratchDir('full-objects');
    const objects = join(storageDir, 'objects');
    // Another file system than tmp/, so the move is a copy (as with a separate volume for objects).
    expect(await mountSmallDisk(objects, '16k')).toBeNull();
    mounts.push(objects);
    const t = await startOn(storageDir);
    const f = await campaignFixture(t);
    const target = await createRun(t.http, f.tokens.lead, f.campaign.id, 'Full object store');
    const clip = await media.unique(media.clip());
    expect(readFileSync(clip).length).toBeGreaterThan(16 * 1024);

    const res = await upload(t.http, f.tokens.lead, target.id, clip);
    expect(res.status).toBe(507);
    expect(res.body.message).toBe(STORAGE_FULL);
    expect(await recordingRows(t, target.id)).toBe(0);
    expect(stored(storageDir)).toEqual([]);
    // Nothing in the audit trail either: the row and its audit entry were never written.
    const [audit] = await t.dataSource.query(
      `SELECT count(*)::int AS n FROM audit_entries WHERE campaign_id = $1 AND entity_type = 'recording'`,
      [f.campaign.id],
    );
    expect(audit.n).toBe(0);
  }, 90_000);
});

describe('corrupt videos', () => {
  const media = new TestMedia();
  let t: TestApp;
  let f: Fixture;
  /** The ftyp box of a real MP4 (its first box): what makes a file look like a video by its type. */
  let mp4Head: Buffer;

  beforeAll(async () => {
    t = await startTestApp();
    f = await campaignFixture(t);
    const clip = readFileSync(await media.clip());
    const ftypLength = clip.readUInt32BE(0);
    expect(clip.subarray(4, 8).toString('latin1')).toBe('ftyp');
    mp4Head = clip.subarray(0, ftypLength);
  });
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  const cases: Array<[string, () => Buffer]> = [
    ['random bytes behind a real MP4 header', () => Buffer.concat([mp4Head, randomBytes(256 * 1024)])],
    ['an MP4 header and nothing else', () => Buffer.from(mp4Head)],
  ];

  it.each(cases)('%s: accepted by its type, then failed with a reason in words; the next upload is processed', async (label, make) => {
    const bad = await createRun(t.http, f.tokens.lead, f.campaign.id, `Corrupt: ${label}`);
    const good = await createRun(t.http, f.tokens.lead, f.campaign.id, `Good after: ${label}`);
    const res = await upload(t.http, f.tokens.lead, bad.id, media.file(`${bad.id}.mp4`, make()));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect((res.body as Recording).mimeType).toBe('video/mp4');
    // Queued right behind the corrupt one, so the worker must get past it.
    expect((await upload(t.http, f.tokens.lead, good.id, await media.unique(media.clip()))).status).toBe(201);

    const failed = await waitForStatus(t.http, f.tokens.lead, bad.id, ['ready', 'failed'], 90_000);
    expect(failed).toMatchObject({ status: 'failed', failureReason: DAMAGED, probe: null, proxy: null, progress: 0 });
    const ready = await waitForStatus(t.http, f.tokens.lead, good.id, ['ready', 'failed'], 90_000);
    expect(ready).toMatchObject({ status: 'ready', progress: 100, failureReason: null });

    // A damaged file is a permanent failure: no retries are left waiting, and the server still answers.
    const [job] = await t.dataSource.query(
      `SELECT state FROM pgboss.job WHERE name = 'recording.process' AND data->>'recordingId' = $1`,
      [failed.id],
    );
    expect(job.state).toBe('completed');
    expect((await t.http.get('/api/health')).status).toBe(200);
  }, 200_000);
});

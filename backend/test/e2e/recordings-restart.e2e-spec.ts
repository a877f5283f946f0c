import type { Recording } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FfmpegRunner } from '../../src/modules/recordings/media/ffmpeg-runner';
import { TestMedia } from '../helpers/media';
import { campaignFixture, createRun, upload, waitForStatus } from '../helpers/recordings';
import { bearer, scratchDir, startTestApp, type TestApp } from '../helpers/test-app';

describe('recording jobs survive a restart', () => {
  const media = new TestMedia();
  const open: TestApp[] = [];
  const start = async (env: Record<string, string>, storageDir: string) => {
    const t = await startTestApp({ env, overrides: { storageDir } });
    open.push(t);
    return t;
  };
  const stop = async (t: TestApp) => {
    open.splice(open.indexOf(t), 1);
    await t.close();
  };

  beforeAll(async () => {
    await media.long();
  });
  afterAll(async () => {
    for (const t of open) await t.close();
    media.remove();
  });

  it('a transcode stopped by shutdown is finished by the next server on the same database', async () => {
    const storageDir = scratchDir('restart');
    const first = await start({}, storageDir);
    const f = await campaignFixture(first);
    const run = await createRun(first.http, f.tokens.lead, f.campaign.id);
    expect((await upload(first.http, f.tokens.lead, run.id, await media.unique(media.long()))).status).toBe(201);

    // Wait until ffmpeg is visibly under way, then stop the server in the middle of it.
    const deadline = Date.now() + 30_000;
    let seen: Recording | undefined;
    while (Date.now() < deadline) {
      seen = (await first.http.get(`/api/runs/${run.id}/recording`).set(bearer(f.tokens.lead))).body as Recording;
      if (seen.status === 'transcoding' && seen.progress > 0) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    expect(seen).toMatchObject({ status: 'transcoding' });
    expect(seen?.progress).toBeGreaterThan(0);
    expect(seen?.progress).toBeLessThan(100);
    const runner = first.app.get(FfmpegRunner);
    await stop(first);
    expect(runner.runningCount).toBe(0);

    const second = await start({}, storageDir);
    // Bounded retries for faults another attempt may cure, and room for a long transcode.
    const [queue] = await second.dataSource.query(
      `SELECT retry_limit, retry_delay, expire_seconds FROM pgboss.queue WHERE name = 'recording.process'`,
    );
    expect(queue).toEqual({ retry_limit: 2, retry_delay: 30, expire_seconds: 6 * 3600 });
    // Handed back at shutdown: unclaimed, still unfinished, and queued again.
    const [row] = await second.dataSource.query('SELECT status FROM recordings WHERE run_id = $1', [run.id]);
    expect(['probing', 'transcoding']).toContain(row.status);
    const done = await waitForStatus(second.http, f.tokens.lead, run.id, ['ready', 'failed'], 90_000);
    expect(done).toMatchObject({ status: 'ready', progress: 100, failureReason: null, proxy: { width: 1280, height: 720 } });
    const frames = await second.http.get(`/api/recordings/${done.id}/frames`).set(bearer(f.tokens.lead));
    expect(frames.body.times).toHaveLength(360);
    await stop(second);
  }, 150_000);

  it('a recording left half-done by a process that died is taken up again when a worker starts', async () => {
    const storageDir = scratchDir('restart');
    const api = await start({ WORKER: 'off' }, storageDir);
    const f = await campaignFixture(api);
    const run = await createRun(api.http, f.tokens.lead, f.campaign.id);
    const rec = (await upload(api.http, f.tokens.lead, run.id, await media.unique(media.clip()))).body as Recording;
    // What a worker killed with SIGKILL leaves: its job still "active", the recording in
    // "transcoding" with a heartbeat that stopped minutes ago.
    const [deadJobs] = (await api.dataSource.query(
      `UPDATE pgboss.job SET state = 'active', started_on = now() - interval '10 minutes'
        WHERE name = 'recording.process' AND data->>'recordingId' = $1 RETURNING id`,
      [rec.id],
    )) as [Array<{ id: string }>, number];
    expect(deadJobs).toHaveLength(1);
    await api.dataSource.query(
      `UPDATE recordings SET status = 'transcoding', progress = 40, claim_id = $2, heartbeat_at = now() - interval '10 minutes' WHERE id = $1`,
      [rec.id, deadJobs[0].id],
    );
    await stop(api);

    const worker = await start({}, storageDir);
    const done = await waitForStatus(worker.http, f.tokens.lead, run.id, ['ready', 'failed'], 60_000);
    expect(done).toMatchObject({ status: 'ready', progress: 100 });
    await stop(worker);
  }, 90_000);
});

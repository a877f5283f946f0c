import type { VideoProbe } from '@dialsheet/common';
import { Injectable, Logger, OnModuleDestroy, OnModuleInit } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { randomUUID } from 'node:crypto';
import { rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type PgBoss from 'pg-boss';
import { DataSource, type EntityManager } from 'typeorm';
import { JOBS_SCHEMA, JobsService } from '../../../jobs/jobs.service';
import { recordingKey } from '../../../storage/storage-keys';
import { StorageService } from '../../../storage/storage.service';
import { posterArgs, probeArgs, packetTimesArgs, proxyArgs } from '../media/ffmpeg-args';
import { FfmpegProgressParser } from '../media/ffmpeg-progress';
import { FfmpegRunner } from '../media/ffmpeg-runner';
import { parsePacketTimes, parseProbe, type PacketTimes } from '../media/ffprobe-parse';
import { describeProcessingFailure } from '../media/failure-reasons';
import { RecordingEntity } from '../recording.entity';

export const RECORDING_QUEUE = 'recording.process';

export interface RecordingJobData {
  recordingId: string;
}

/** Queue settings: two more attempts after a failure that another attempt could cure. */
export const RECORDING_QUEUE_SETTINGS = {
  retryLimit: 2,
  retryDelaySeconds: 30,
  // A whole transcode runs within one attempt; hours of 4K footage on two cores fit in this.
  expireInSeconds: 6 * 60 * 60,
};

/** Progress is written at most this often. */
const PROGRESS_INTERVAL_MS = 500;
/** A worker proves it is alive this often while it holds a recording. */
const HEARTBEAT_INTERVAL_MS = 5_000;
/** A recording whose worker has been silent this long is taken over by another worker. */
export const STALE_AFTER_SECONDS = 120;
/** How often a worker looks for recordings that a dead process left unfinished. */
const SWEEP_INTERVAL_MS = 30_000;

export type FailureOutcome = 'fail' | 'retry';

/**
 * After a failed attempt: a fault of the file fails the recording at once, as does any fault
 * on the last allowed attempt; anything else goes back to the queue for another try.
 */
export function outcomeOfFailure(permanent: boolean, retryCount: number, retryLimit: number): FailureOutcome {
  return permanent || retryCount >= retryLimit ? 'fail' : 'retry';
}

/** Signals that the recording was deleted or replaced (or taken over) while being processed. */
class ClaimLost extends Error {
  override name = 'ClaimLost';
}

/** Frame of the poster: a little into the video, past black first frames and clapper boards. */
function posterTime(probe: VideoProbe, frameTimes: number[]): number {
  const target = Math.min(probe.durationSec * 0.1, 5);
  const first = frameTimes[0] ?? 0;
  return Math.max(0, target - first);
}

/**
 * One attempt at one recording. The attempt claims the row with a fresh claim id; writes go
 * through `guarded`, which only touches the row while that claim holds, so a deleted, replaced
 * or taken-over recording is left alone and the attempt stops. (A claim per attempt, not per
 * queue job: pg-boss retries a job under the same id, possibly while an expired attempt of it
 * still runs.)
 */
class Attempt {
  private readonly abort = new AbortController();
  private lastProgressAt = 0;
  private progressWrite: Promise<void> = Promise.resolve();
  private heartbeat: NodeJS.Timeout | null = null;
  lost = false;

  constructor(
    private readonly dataSource: DataSource,
    readonly recordingId: string,
    readonly claimId: string,
    shutdown: AbortSignal,
  ) {
    if (shutdown.aborted) this.abort.abort();
    shutdown.addEventListener('abort', () => this.abort.abort(), { once: true });
  }

  get signal(): AbortSignal {
    return this.abort.signal;
  }

  start(): void {
    this.heartbeat = setInterval(() => void this.guarded('heartbeat_at = now()').catch(() => undefined), HEARTBEAT_INTERVAL_MS);
    this.heartbeat.unref();
  }

  async stop(): Promise<void> {
    if (this.heartbeat) clearInterval(this.heartbeat);
    this.heartbeat = null;
    await this.progressWrite.catch(() => undefined);
  }

  /** Runs `UPDATE recordings SET <set>` on this job's recording; throws ClaimLost if it is no longer ours. */
  async guarded(set: string, params: unknown[] = [], manager: EntityManager = this.dataSource.manager): Promise<void> {
    const [, affected] = (await manager.query(
      `UPDATE recordings SET ${set}, updated_at = now() WHERE id = $1 AND claim_id = $2`,
      [this.recordingId, this.claimId, ...params],
    )) as [unknown, number];
    if (affected === 0) {
      this.lost = true;
      this.abort.abort();
      throw new ClaimLost(`recording ${this.recordingId} is no longer held by claim ${this.claimId}`);
    }
  }

  /** Throttled: at most one write per PROGRESS_INTERVAL_MS, never two at once. */
  progress(percent: number): void {
    const now = Date.now();
    if (now - this.lastProgressAt < PROGRESS_INTERVAL_MS) return;
    this.lastProgressAt = now;
    this.progressWrite = this.progressWrite
      .then(() => this.guarded('progress = $3, heartbeat_at = now()', [Math.min(99.9, percent)]))
      .catch(() => undefined);
  }
}

/**
 * Makes a recording playable: ffprobe facts and every frame's time, an H.264 proxy tuned for
 * stepping, and a poster image. Runs as the `recording.process` job; the original is only read.
 */
@Injectable()
export class RecordingProcessor implements OnModuleInit, OnModuleDestroy {
  private readonly logger = new Logger('RecordingProcessor');
  private sweepTimer: NodeJS.Timeout | null = null;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly storage: StorageService,
    private readonly ffmpeg: FfmpegRunner,
    private readonly jobs: JobsService,
  ) {}

  onModuleInit(): void {
    this.jobs.defineQueue(RECORDING_QUEUE, RECORDING_QUEUE_SETTINGS);
    this.jobs.registerWorker<RecordingJobData>(
      RECORDING_QUEUE,
      (job) => this.handle(job),
      () => this.startSweeping(),
    );
  }

  onModuleDestroy(): void {
    if (this.sweepTimer) clearInterval(this.sweepTimer);
    this.sweepTimer = null;
  }

  /** Enqueues processing for a recording, inside the caller's transaction when one is given. */
  enqueue(recordingId: string, manager?: EntityManager): Promise<string> {
    return this.jobs.send(RECORDING_QUEUE, { recordingId } satisfies RecordingJobData, { manager });
  }

  wake(): void {
    this.jobs.wake(RECORDING_QUEUE);
  }

  async handle(job: PgBoss.JobWithMetadata<RecordingJobData>): Promise<void> {
    const recordingId = job.data?.recordingId;
    if (typeof recordingId !== 'string' || !isUUID(recordingId)) {
      this.logger.warn(`job ${job.id} has no recording id; dropped`);
      return;
    }
    const claimId = randomUUID();
    const recording = await this.claim(recordingId, claimId);
    if (!recording) return;
    const attempt = new Attempt(this.dataSource, recordingId, claimId, this.jobs.shutdownSignal);
    attempt.start();
    try {
      await this.process(recording, attempt);
    } catch (error) {
      await attempt.stop();
      if (attempt.lost || error instanceof ClaimLost) {
        this.logger.log(`recording ${recordingId} was removed or replaced while processing; stopped`);
        return;
      }
      if (this.jobs.shutdownSignal.aborted) {
        await this.handBack(recordingId, claimId);
        return;
      }
      const failure = describeProcessingFailure(error);
      const detail = error instanceof Error ? error.message : String(error);
      const tail = (error as { stderrTail?: string }).stderrTail;
      this.logger.warn(
        `recording ${recordingId}, attempt ${job.retryCount + 1}: ${detail}${tail ? `\n${tail}` : ''}`,
      );
      if (outcomeOfFailure(failure.permanent, job.retryCount, job.retryLimit) === 'fail') {
        await this.fail(recordingId, claimId, failure.reason);
        return;
      }
      // Let go so the retry (a new fetch of this job) can claim it again; pg-boss schedules it.
      await this.release(recordingId, claimId);
      throw error;
    } finally {
      await attempt.stop();
    }
  }

  /**
   * Takes the recording for one attempt, restarting it from probing. Succeeds when no live
   * attempt holds it: never claimed, released, or silent for STALE_AFTER_SECONDS.
   */
  private async claim(recordingId: string, claimId: string): Promise<RecordingEntity | null> {
    const rows = (await this.dataSource.query(
      `UPDATE recordings
          SET claim_id = $2, heartbeat_at = now(), status = 'probing', progress = 0, updated_at = now()
        WHERE id = $1
          AND status IN ('uploaded', 'probing', 'transcoding')
          AND (claim_id IS NULL OR heartbeat_at IS NULL OR heartbeat_at < now() - make_interval(secs => $3))
        RETURNING id`,
      [recordingId, claimId, STALE_AFTER_SECONDS],
    )) as [Array<{ id: string }>, number];
    if (rows[1] === 0) return null;
    return this.dataSource.getRepository(RecordingEntity).findOneBy({ id: recordingId });
  }

  private async process(recording: RecordingEntity, attempt: Attempt): Promise<void> {
    const id = recording.id;
    const started = Date.now();
    await this.storage.withLocalFile(recording.originalKey, async (input) => {
      const { probe, packets } = await this.probe(input, attempt.signal);
      await this.dataSource.transaction(async (manager) => {
        await attempt.guarded(`status = 'transcoding', progress = 0, probe = $3, heartbeat_at = now()`, [probe], manager);
        await saveFrameTimes(manager, id, packets);
      });

      const workDir = await this.storage.makeWorkDir();
      try {
        const proxyPath = join(workDir, 'proxy.mp4');
        const posterPath = join(workDir, 'poster.jpg');
        const parser = new FfmpegProgressParser(probe.durationSec);
        await this.ffmpeg.run('ffmpeg', proxyArgs(input, proxyPath, probe, { workDir }), {
          signal: attempt.signal,
          onStdout: (chunk) => {
            for (const update of parser.push(chunk)) attempt.progress(update.percent);
          },
        });
        // The frames readers step through are the proxy's own, so list them from the proxy.
        const proxy = await this.probe(proxyPath, attempt.signal);
        await this.ffmpeg.run('ffmpeg', posterArgs(proxyPath, posterPath, posterTime(proxy.probe, proxy.packets.times), { workDir }), {
          signal: attempt.signal,
        });
        const proxySize = (await stat(proxyPath)).size;
        const proxyKey = recordingKey(id, 'proxy');
        const posterKey = recordingKey(id, 'poster');
        await this.storage.put(proxyKey, proxyPath, { contentType: 'video/mp4' });
        await this.storage.put(posterKey, posterPath, { contentType: 'image/jpeg' });
        try {
          await this.dataSource.transaction(async (manager) => {
            await attempt.guarded(
              `status = 'ready', progress = 100, failure_reason = NULL, proxy_key = $3, poster_key = $4,
               proxy_width = $5, proxy_height = $6, proxy_size_bytes = $7, claim_id = NULL, heartbeat_at = NULL`,
              [proxyKey, posterKey, proxy.probe.displayWidth, proxy.probe.displayHeight, proxySize],
              manager,
            );
            await saveFrameTimes(manager, id, proxy.packets);
          });
        } catch (error) {
          // Deleted or replaced meanwhile: the files just stored belong to nobody.
          if (error instanceof ClaimLost) await this.storage.deleteQuietly([proxyKey, posterKey]);
          throw error;
        }
        if (proxy.packets.times.length !== packets.times.length) {
          this.logger.warn(`recording ${id}: proxy has ${proxy.packets.times.length} frames, original ${packets.times.length}`);
        }
        const seconds = (Date.now() - started) / 1000;
        this.logger.log(`recording ${id} ready in ${seconds.toFixed(1)} s (${(probe.durationSec / seconds).toFixed(2)}× real time)`);
      } finally {
        await rm(workDir, { recursive: true, force: true });
      }
    });
  }

  private async probe(path: string, signal: AbortSignal): Promise<{ probe: VideoProbe; packets: PacketTimes }> {
    const json = await this.ffmpeg.run('ffprobe', probeArgs(path), { signal });
    const csv = await this.ffmpeg.run('ffprobe', packetTimesArgs(path), { signal });
    const packets = parsePacketTimes(csv.stdout);
    return { probe: parseProbe(json.stdout, packets), packets };
  }

  private async fail(recordingId: string, claimId: string, reason: string): Promise<void> {
    await this.dataSource.query(
      `UPDATE recordings
          SET status = 'failed', failure_reason = $3, progress = 0, claim_id = NULL, heartbeat_at = NULL, updated_at = now()
        WHERE id = $1 AND claim_id = $2`,
      [recordingId, claimId, reason],
    );
  }

  private async release(recordingId: string, claimId: string): Promise<void> {
    await this.dataSource.query(
      `UPDATE recordings SET claim_id = NULL, heartbeat_at = NULL, updated_at = now() WHERE id = $1 AND claim_id = $2`,
      [recordingId, claimId],
    );
  }

  /**
   * The process is stopping: give the recording back and queue it again, so the next worker to
   * start takes it up at once without spending one of its attempts on our shutdown.
   */
  private async handBack(recordingId: string, claimId: string): Promise<void> {
    try {
      await this.release(recordingId, claimId);
      await this.enqueue(recordingId);
      this.logger.log(`recording ${recordingId} handed back to the queue at shutdown`);
    } catch (error) {
      // The sweep of the next worker finds it (unclaimed and unfinished) instead.
      this.logger.warn(`could not requeue recording ${recordingId} at shutdown: ${error instanceof Error ? error.message : String(error)}`);
    }
  }

  private async startSweeping(): Promise<void> {
    await this.sweep();
    this.sweepTimer = setInterval(() => {
      this.sweep().catch((error: unknown) => this.logger.warn(`sweep failed: ${error instanceof Error ? error.message : String(error)}`));
    }, SWEEP_INTERVAL_MS);
    this.sweepTimer.unref();
  }

  /**
   * Queues recordings a dead process left unfinished: no worker has touched them for
   * STALE_AFTER_SECONDS and no job waits for them. A job still marked active for a dead worker
   * does not count; the new job takes the recording over (see claim).
   */
  async sweep(): Promise<number> {
    const rows = (await this.dataSource.query(
      `SELECT r.id
         FROM recordings r
        WHERE r.status IN ('uploaded', 'probing', 'transcoding')
          AND (r.claim_id IS NULL OR coalesce(r.heartbeat_at, r.updated_at) < now() - make_interval(secs => $1))
          AND coalesce(r.heartbeat_at, r.updated_at) < now() - make_interval(secs => $2)
          AND NOT EXISTS (
                SELECT 1 FROM ${JOBS_SCHEMA}.job j
                 WHERE j.name = $3 AND j.state IN ('created', 'retry')
                   AND j.data->>'recordingId' = r.id::text)`,
      [STALE_AFTER_SECONDS, 10, RECORDING_QUEUE],
    )) as Array<{ id: string }>;
    for (const { id } of rows) {
      await this.enqueue(id);
      this.logger.log(`recording ${id} was left unfinished; queued again`);
    }
    return rows.length;
  }
}

async function saveFrameTimes(manager: EntityManager, recordingId: string, packets: PacketTimes): Promise<void> {
  await manager.query(
    `INSERT INTO recording_frame_times (recording_id, times, keyframe_times, updated_at)
     VALUES ($1, $2::float8[], $3::float8[], now())
     ON CONFLICT (recording_id) DO UPDATE
       SET times = EXCLUDED.times, keyframe_times = EXCLUDED.keyframe_times, updated_at = now()`,
    [recordingId, packets.times, packets.keyframeTimes],
  );
}

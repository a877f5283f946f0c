import type { MediaKind, MediaUrls, Recording, RecordingFrames } from '@dialsheet/common';
import { BadRequestException, ConflictException, Injectable, Logger, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { randomUUID } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { rm } from 'node:fs/promises';
import { basename } from 'node:path';
import { DataSource, EntityManager, QueryFailedError } from 'typeorm';
import { refuseIfRunHasReadings } from '../runs/run-readings';
import { AppConfig } from '../../config/app-config';
import type { AuthUser } from '../../core/auth-user';
import { recordingKey } from '../../storage/storage-keys';
import { StorageService } from '../../storage/storage.service';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { RUN_WRITERS, RunAccessService } from '../runs/run-access.service';
import { MediaUrlSigner } from './media/media-url-signer';
import { RecordingProcessor } from './processing/recording-processor';
import { RecordingFrameTimesEntity } from './recording-frame-times.entity';
import { RecordingEntity } from './recording.entity';
import { recordingKeys, recordingSnapshot, toRecording } from './recording.mapper';
import { duplicateRecordingError, type DuplicateOf } from './upload/duplicate';
import type { HashedFile } from './upload/hashing-disk-storage';
import { uploadEngine } from './upload/upload-options';

export const RECORDING_NOT_FOUND = 'Recording not found';
export const NO_RECORDING = 'This run has no recording yet';
export const FILE_MISSING = 'Choose a video file to upload in the form field "file"';
export const FILE_EMPTY = 'The file is empty (0 bytes)';

/** A file already on the server's disk, hashed and type-checked, waiting to become a recording. */
export interface IncomingFile {
  /** Temporary path under STORAGE_DIR/tmp; removed whatever happens. */
  path: string;
  originalName: string;
  size: number;
  sha256: string;
  mimeType: string;
}

/** The object behind one media link, ready to be served. */
export interface MediaTarget {
  key: string;
  contentType: string;
  /** Quoted strong ETag when the server knows one without asking storage. */
  etag?: string;
}

/** Names from browsers may carry a path (old IE) or control characters; keep a readable label. */
export function cleanOriginalName(name: string | undefined): string {
  // eslint-disable-next-line no-control-regex
  const base = basename(String(name ?? '').replace(/\\/g, '/')).replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return (base || 'video').slice(0, 255);
}

function isUniqueViolation(error: unknown, constraint: string): boolean {
  const driverError = error instanceof QueryFailedError ? (error.driverError as { code?: string; constraint?: string }) : null;
  return driverError?.code === '23505' && driverError.constraint === constraint;
}

@Injectable()
export class RecordingsService {
  private readonly logger = new Logger('Recordings');
  private readonly signer: MediaUrlSigner;

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly config: AppConfig,
    private readonly access: CampaignAccessService,
    private readonly runAccess: RunAccessService,
    private readonly audit: AuditService,
    private readonly storage: StorageService,
    private readonly processor: RecordingProcessor,
  ) {
    this.signer = new MediaUrlSigner(config.jwtSecret);
  }

  /** After multer: the file is on disk under a server-chosen name, or the request had none. */
  async upload(user: AuthUser, runId: string, file: HashedFile | undefined): Promise<Recording> {
    try {
      if (!file) throw new BadRequestException(FILE_MISSING);
      if (file.size === 0) throw new BadRequestException(FILE_EMPTY);
      // The engine checks the type of every non-empty file; a file without one skipped the engine.
      if (!file.detectedType) throw new Error('upload reached the service without a type check');
      return await this.accept(user, runId, {
        path: file.path,
        originalName: cleanOriginalName(file.originalname),
        size: file.size,
        sha256: file.sha256,
        mimeType: file.detectedType,
      });
    } finally {
      if (file?.path) await rm(file.path, { force: true });
    }
  }

  /**
   * The upload path for a file already on this machine (the demo seed): copied into
   * STORAGE_DIR/tmp while hashing and type-checking exactly as an upload, then accepted.
   */
  async ingestLocalFile(user: AuthUser, runId: string, sourcePath: string): Promise<Recording> {
    const engine = uploadEngine(this.storage.tmpDir);
    const stream = createReadStream(sourcePath);
    const info = await new Promise<HashedFile>((resolve, reject) => {
      const file = { originalname: basename(sourcePath), stream } as unknown as Express.Multer.File;
      engine._handleFile({} as never, file, (error, result) => (error ? reject(error) : resolve({ ...file, ...result } as HashedFile)));
    });
    return this.upload(user, runId, info);
  }

  /**
   * Stores a checked file as the run's recording and queues its processing. The checks run
   * before the (possibly long) move into storage and again under the run's lock; the row, its
   * audit entry and the job commit together. A replaced recording's files go after the commit.
   */
  private async accept(user: AuthUser, runId: string, incoming: IncomingFile): Promise<Recording> {
    const { run } = await this.runAccess.require(user, runId, RUN_WRITERS, { writable: true });
    await this.refuseDuplicate(this.dataSource.manager, run.campaignId, incoming.sha256);

    const recordingId = randomUUID();
    const originalKey = recordingKey(recordingId, 'original');
    await this.storage.put(originalKey, incoming.path, { contentType: incoming.mimeType });
    let replaced: RecordingEntity | null = null;
    let saved: RecordingEntity;
    try {
      saved = await this.dataSource.transaction(async (manager) => {
        const { run: locked } = await this.runAccess.require(user, runId, RUN_WRITERS, { manager, lock: true, writable: true });
        await this.refuseDuplicate(manager, locked.campaignId, incoming.sha256);
        replaced = await manager.findOneBy(RecordingEntity, { runId });
        const common = { campaignId: locked.campaignId, actorId: user.id };
        if (replaced) {
          await refuseIfRunHasReadings(manager, locked.id, 'replace its recording');
          await manager.delete(RecordingEntity, { id: replaced.id });
          await this.audit.record(manager, {
            ...common,
            entityType: 'recording',
            entityId: replaced.id,
            action: 'delete',
            before: recordingSnapshot(replaced, locked.name),
            reason: 'Replaced by a new upload',
          });
        }
        const recording = await manager.save(
          manager.create(RecordingEntity, {
            id: recordingId,
            runId,
            campaignId: locked.campaignId,
            originalName: incoming.originalName,
            sizeBytes: incoming.size,
            sha256: incoming.sha256,
            mimeType: incoming.mimeType,
            status: 'uploaded',
            progress: 0,
            failureReason: null,
            probe: null,
            originalKey,
            uploadedById: user.id,
          }),
        );
        await this.audit.record(manager, {
          ...common,
          entityType: 'recording',
          entityId: recording.id,
          action: 'create',
          after: { ...recordingSnapshot(recording, locked.name), ...(replaced ? { replaces: replaced.id } : {}) },
        });
        await this.processor.enqueue(recording.id, manager);
        return recording;
      });
    } catch (error) {
      await this.storage.deleteQuietly([originalKey]);
      if (isUniqueViolation(error, 'recordings_campaign_sha256_key')) {
        // Another upload of the same bytes committed between our check and our insert.
        await this.refuseDuplicate(this.dataSource.manager, run.campaignId, incoming.sha256);
      }
      throw error;
    }
    const old = replaced as RecordingEntity | null;
    if (old) await this.storage.deleteQuietly(recordingKeys(old));
    this.processor.wake();
    this.logger.log(`recording ${saved.id} stored for run ${runId} (${incoming.size} bytes${old ? `, replaces ${old.id}` : ''})`);
    return toRecording(saved);
  }

  private async refuseDuplicate(manager: EntityManager, campaignId: string, sha256: string): Promise<void> {
    const rows = (await manager.query(
      `SELECT r.id AS "recordingId", r.run_id AS "runId", u.name AS "runName"
         FROM recordings r JOIN runs u ON u.id = r.run_id
        WHERE r.campaign_id = $1 AND r.sha256 = $2`,
      [campaignId, sha256],
    )) as DuplicateOf[];
    if (rows.length > 0) throw duplicateRecordingError(rows[0]);
  }

  async get(user: AuthUser, runId: string): Promise<Recording> {
    await this.runAccess.require(user, runId);
    const recording = await this.dataSource.getRepository(RecordingEntity).findOneBy({ runId });
    if (!recording) throw new NotFoundException(NO_RECORDING);
    return toRecording(recording);
  }

  async remove(user: AuthUser, runId: string): Promise<void> {
    const keys = await this.dataSource.transaction(async (manager) => {
      const { run } = await this.runAccess.require(user, runId, RUN_WRITERS, { manager, lock: true, writable: true });
      const recording = await manager.findOneBy(RecordingEntity, { runId });
      if (!recording) throw new NotFoundException(NO_RECORDING);
      await refuseIfRunHasReadings(manager, run.id, 'remove its recording');
      await manager.delete(RecordingEntity, { id: recording.id });
      // Sync marks point into this video's timeline; they mean nothing for the next one.
      const before: Record<string, unknown> = recordingSnapshot(recording, run.name);
      if (run.sync) {
        before.sync = run.sync;
        run.sync = null;
        await manager.save(run);
      }
      await this.audit.record(manager, {
        campaignId: run.campaignId,
        actorId: user.id,
        entityType: 'recording',
        entityId: recording.id,
        action: 'delete',
        before,
      });
      return recordingKeys(recording);
    });
    await this.storage.deleteQuietly(keys);
  }

  async frames(user: AuthUser, recordingId: string): Promise<RecordingFrames> {
    const recording = await this.requireRecording(user, recordingId);
    const frames = await this.dataSource.getRepository(RecordingFrameTimesEntity).findOneBy({ recordingId });
    if (!frames) {
      if (recording.status === 'failed') throw new ConflictException('This recording failed to process, so it has no frame times');
      throw new ConflictException('This recording is still processing; its frame times are not known yet');
    }
    return { recordingId, times: frames.times, keyframeTimes: frames.keyframeTimes };
  }

  async mediaUrls(user: AuthUser, recordingId: string): Promise<MediaUrls> {
    const recording = await this.requireRecording(user, recordingId);
    const now = Date.now();
    const exp = Math.floor(now / 1000) + this.config.mediaUrlTtlSeconds;
    return {
      proxyUrl: recording.proxyKey ? this.signer.url(recording.id, 'proxy', exp) : null,
      originalUrl: this.signer.url(recording.id, 'original', exp),
      posterUrl: recording.posterKey ? this.signer.url(recording.id, 'poster', exp) : null,
      expiresAt: new Date(exp * 1000).toISOString(),
      issuedAt: new Date(now).toISOString(),
    };
  }

  /** For the public media route, after its signature was checked. */
  checkMediaLink(recordingId: string, kind: string, exp: unknown, sig: unknown) {
    return this.signer.verify(recordingId, kind, exp, sig);
  }

  async mediaTarget(recordingId: string, kind: MediaKind): Promise<MediaTarget> {
    const recording = isUUID(recordingId) ? await this.dataSource.getRepository(RecordingEntity).findOneBy({ id: recordingId }) : null;
    if (!recording) throw new NotFoundException(RECORDING_NOT_FOUND);
    if (kind === 'original') {
      return { key: recording.originalKey, contentType: recording.mimeType, etag: `"${recording.sha256}"` };
    }
    if (kind === 'proxy') {
      if (!recording.proxyKey) throw new NotFoundException('The playback copy of this recording is not ready yet');
      return { key: recording.proxyKey, contentType: 'video/mp4' };
    }
    if (!recording.posterKey) throw new NotFoundException('The poster image of this recording is not ready yet');
    return { key: recording.posterKey, contentType: 'image/jpeg' };
  }

  /** Any member of the recording's campaign. */
  private async requireRecording(user: AuthUser, recordingId: string): Promise<RecordingEntity> {
    const recording = isUUID(recordingId) ? await this.dataSource.getRepository(RecordingEntity).findOneBy({ id: recordingId }) : null;
    if (!recording) throw new NotFoundException(RECORDING_NOT_FOUND);
    try {
      await this.access.require(user, recording.campaignId);
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(RECORDING_NOT_FOUND);
      throw error;
    }
    return recording;
  }
}

import { validateSyncMarks, type Run, type SyncMarks } from '@dialsheet/common';
import { BadRequestException, ConflictException, Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager, In } from 'typeorm';
import { refuseIfRunHasReadings } from './run-readings';
import type { AuthUser } from '../../core/auth-user';
import { StorageService } from '../../storage/storage.service';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService } from '../campaigns/campaign-access.service';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { RecordingEntity } from '../recordings/recording.entity';
import { recordingKeys, recordingSnapshot } from '../recordings/recording.mapper';
import { CreateRunDto } from './dto/create-run.dto';
import { SetSyncDto } from './dto/set-sync.dto';
import { UpdateRunDto } from './dto/update-run.dto';
import { RUN_WRITERS, RunAccessService } from './run-access.service';
import { RunEntity } from './run.entity';
import { runSnapshot, toRun } from './run.mapper';

const EDITABLE = ['name', 'runDate', 'configuration', 'operator', 'notes'] as const;

@Injectable()
export class RunsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
    private readonly runAccess: RunAccessService,
    private readonly audit: AuditService,
    private readonly storage: StorageService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<Run[]> {
    await this.access.require(user, campaignId);
    const runs = await this.dataSource.getRepository(RunEntity).find({
      where: { campaignId },
      // Runs made together (the demo seed) share a timestamp; their names then give the order.
      order: { createdAt: 'ASC', name: 'ASC', id: 'ASC' },
    });
    const recordings = await this.recordingsOf(this.dataSource.manager, runs.map((r) => r.id));
    return runs.map((run) => toRun(run, recordings.get(run.id) ?? null));
  }

  async get(user: AuthUser, runId: string): Promise<Run> {
    const { run } = await this.runAccess.require(user, runId);
    return this.present(this.dataSource.manager, run);
  }

  async create(user: AuthUser, campaignId: string, dto: CreateRunDto): Promise<Run> {
    return this.dataSource.transaction(async (manager) => {
      const { campaign } = await this.access.require(user, campaignId, RUN_WRITERS, { manager });
      if (campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      const run = await manager.save(
        manager.create(RunEntity, {
          campaignId,
          name: dto.name,
          runDate: dto.runDate ?? null,
          configuration: dto.configuration ?? '',
          operator: dto.operator ?? '',
          notes: dto.notes ?? '',
          sync: null,
          createdById: user.id,
        }),
      );
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'run',
        entityId: run.id,
        action: 'create',
        after: runSnapshot(run),
      });
      return toRun(run, null);
    });
  }

  async update(user: AuthUser, runId: string, dto: UpdateRunDto): Promise<Run> {
    return this.dataSource.transaction(async (manager) => {
      const { run } = await this.runAccess.require(user, runId, RUN_WRITERS, { manager, lock: true, writable: true });
      const before: Record<string, unknown> = {};
      const after: Record<string, unknown> = {};
      for (const key of EDITABLE) {
        const value = dto[key];
        if (value !== undefined && value !== run[key]) {
          before[key] = run[key];
          after[key] = value;
        }
      }
      if (Object.keys(after).length === 0) return this.present(manager, run);
      Object.assign(run, after);
      const saved = await manager.save(run);
      await this.audit.record(manager, {
        campaignId: run.campaignId,
        actorId: user.id,
        entityType: 'run',
        entityId: run.id,
        action: 'update',
        before,
        after,
        reason: dto.reason,
      });
      return this.present(manager, saved);
    });
  }

  /** Removes the run and its recording; the files go once the rows are gone. */
  async remove(user: AuthUser, runId: string): Promise<void> {
    const keys = await this.dataSource.transaction(async (manager) => {
      const { run } = await this.runAccess.require(user, runId, RUN_WRITERS, { manager, lock: true, writable: true });
      await refuseIfRunHasReadings(manager, run.id, 'delete the run');
      const recording = await manager.findOneBy(RecordingEntity, { runId });
      const common = { campaignId: run.campaignId, actorId: user.id };
      if (recording) {
        await manager.delete(RecordingEntity, { id: recording.id });
        await this.audit.record(manager, {
          ...common,
          entityType: 'recording',
          entityId: recording.id,
          action: 'delete',
          before: recordingSnapshot(recording, run.name),
          reason: 'The run was deleted',
        });
      }
      await manager.delete(RunEntity, { id: run.id });
      await this.audit.record(manager, {
        ...common,
        entityType: 'run',
        entityId: run.id,
        action: 'delete',
        before: runSnapshot(run),
      });
      return recording ? recordingKeys(recording) : [];
    });
    await this.storage.deleteQuietly(keys);
  }

  async setSync(user: AuthUser, runId: string, dto: SetSyncDto): Promise<Run> {
    const marks: SyncMarks = {
      first: { videoTime: dto.first.videoTime, testTime: dto.first.testTime },
      ...(dto.second ? { second: { videoTime: dto.second.videoTime, testTime: dto.second.testTime } } : {}),
    };
    try {
      validateSyncMarks(marks);
    } catch (error) {
      if (error instanceof RangeError) throw new BadRequestException(error.message);
      throw error;
    }
    return this.dataSource.transaction(async (manager) => {
      const { run } = await this.runAccess.require(user, runId, RUN_WRITERS, { manager, lock: true, writable: true });
      const recording = await manager.findOneBy(RecordingEntity, { runId });
      if (!recording) throw new ConflictException('Upload the recording of this run before marking its sync frames');
      const duration = recording.probe?.durationSec;
      if (duration !== undefined) {
        for (const [name, mark] of Object.entries(marks) as Array<[string, { videoTime: number }]>) {
          if (mark.videoTime > duration) {
            throw new BadRequestException(
              `${name}.videoTime must lie within the video (0–${duration.toFixed(3)} s), got ${mark.videoTime} s`,
            );
          }
        }
      }
      const before = { sync: run.sync };
      run.sync = marks;
      const saved = await manager.save(run);
      await this.audit.record(manager, {
        campaignId: run.campaignId,
        actorId: user.id,
        entityType: 'run',
        entityId: run.id,
        action: 'update',
        before,
        after: { sync: marks },
        reason: dto.reason,
      });
      return this.present(manager, saved, recording);
    });
  }

  private async present(manager: EntityManager, run: RunEntity, recording?: RecordingEntity | null): Promise<Run> {
    const found = recording === undefined ? await manager.findOneBy(RecordingEntity, { runId: run.id }) : recording;
    return toRun(run, found);
  }

  private async recordingsOf(manager: EntityManager, runIds: string[]): Promise<Map<string, RecordingEntity>> {
    if (runIds.length === 0) return new Map();
    const rows = await manager.find(RecordingEntity, { where: { runId: In(runIds) } });
    return new Map(rows.map((r) => [r.runId, r]));
  }
}

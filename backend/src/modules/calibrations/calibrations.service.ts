import type { CalibrationChain, ChannelCalibration } from '@dialsheet/common';
import { compileChain } from '@dialsheet/common/dist/analysis';
import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { CHANNEL_NOT_FOUND } from '../channels/channels.service';
import { refuseIfChannelLocked } from '../runs/run-lock';
import { asBadRequest, checkBaseVersion, isPlainObject } from './analysis-input';
import { AnalysisSetupAccess, CHANNEL_SQL, type ChannelRow } from './analysis-setup-access';
import { campaignCalibrations, channelCalibration, toCalibration } from './calibration-records';
import { SetCalibrationDto } from './dto/set-calibration.dto';

/** More steps than any real instrument chain; keeps a stored chain small. */
export const MAX_CHAIN_STEPS = 20;
export const MAX_TABLE_POINTS = 500;

/** Structure the wire type promises, before compileChain judges the content. */
export function chainShapeProblem(chain: unknown): string | null {
  if (!isPlainObject(chain) || !Array.isArray(chain.steps)) return 'chain must be an object with a list of steps';
  if (chain.steps.length === 0) return 'chain needs at least one step; delete the calibration to use the channel in its raw unit';
  if (chain.steps.length > MAX_CHAIN_STEPS) return `chain has ${chain.steps.length} steps; at most ${MAX_CHAIN_STEPS}`;
  for (const [i, step] of chain.steps.entries()) {
    if (!isPlainObject(step)) return `chain.steps.${i} must be an object`;
    if (Array.isArray(step.points) && step.points.length > MAX_TABLE_POINTS) return `chain.steps.${i} has ${step.points.length} points; at most ${MAX_TABLE_POINTS}`;
  }
  return null;
}

@Injectable()
export class CalibrationsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly setup: AnalysisSetupAccess,
    private readonly audit: AuditService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<ChannelCalibration[]> {
    await this.setup.read(user, campaignId);
    return (await campaignCalibrations(this.dataSource.manager, campaignId)).map(toCalibration);
  }

  /** Creates or replaces the channel's chain; the first step must take the display's unit. */
  async set(user: AuthUser, channelId: string, dto: SetCalibrationDto): Promise<ChannelCalibration> {
    return this.dataSource.transaction(async (manager) => {
      const { row: channel } = await this.setup.row<ChannelRow>(user, manager, channelId, CHANNEL_SQL, CHANNEL_NOT_FOUND, 'write');
      await refuseIfChannelLocked(manager, channel.id);
      const stored = await channelCalibration(manager, channel.id);
      checkBaseVersion('calibration', stored, dto.baseVersion, stored ? toCalibration(stored) : null);
      const shape = chainShapeProblem(dto.chain);
      if (shape) throw new BadRequestException(shape);
      const chain = { steps: dto.chain.steps } as CalibrationChain;
      const compiled = asBadRequest(() => compileChain(chain, channel.raw_unit));
      const engineeringUnit = compiled.unit;
      if (stored && JSON.stringify(stored.chain) === JSON.stringify(chain)) return toCalibration(stored);
      await manager.query(
        `INSERT INTO channel_calibrations (channel_id, chain, engineering_unit, version, updated_at, updated_by)
         VALUES ($1, $2, $3, 1, now(), $4)
         ON CONFLICT (channel_id) DO UPDATE
           SET chain = EXCLUDED.chain, engineering_unit = EXCLUDED.engineering_unit,
               version = channel_calibrations.version + 1, updated_at = now(), updated_by = EXCLUDED.updated_by`,
        [channel.id, JSON.stringify(chain), engineeringUnit, user.id],
      );
      const saved = (await channelCalibration(manager, channel.id))!;
      await this.audit.record(manager, {
        campaignId: channel.campaign_id,
        actorId: user.id,
        entityType: 'calibration',
        entityId: channel.id,
        action: stored ? 'update' : 'create',
        before: stored ? { chain: stored.chain, engineeringUnit: stored.engineering_unit, version: stored.version } : null,
        after: { channel: channel.symbol, chain, engineeringUnit, version: saved.version },
        reason: dto.reason,
      });
      return toCalibration(saved);
    });
  }

  /** The channel is used in its raw unit again; analyses that used the chain turn stale. */
  async remove(user: AuthUser, channelId: string, baseVersion: number | undefined): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const { row: channel } = await this.setup.row<ChannelRow>(user, manager, channelId, CHANNEL_SQL, CHANNEL_NOT_FOUND, 'write');
      await refuseIfChannelLocked(manager, channel.id);
      const stored = await channelCalibration(manager, channel.id);
      if (!stored) throw new NotFoundException('This channel has no calibration');
      if (baseVersion === undefined) throw new BadRequestException('baseVersion is required: the version of the calibration you are deleting');
      checkBaseVersion('calibration', stored, baseVersion, toCalibration(stored));
      await manager.query('DELETE FROM channel_calibrations WHERE channel_id = $1', [channel.id]);
      await this.audit.record(manager, {
        campaignId: channel.campaign_id,
        actorId: user.id,
        entityType: 'calibration',
        entityId: channel.id,
        action: 'delete',
        before: { channel: channel.symbol, chain: stored.chain, engineeringUnit: stored.engineering_unit, version: stored.version },
      });
    });
  }
}

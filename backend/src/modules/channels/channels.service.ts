import type { Channel, CampaignRole } from '@dialsheet/common';
import { BadRequestException, ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { DataSource, EntityManager, QueryFailedError } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService, type CampaignAccess } from '../campaigns/campaign-access.service';
import { ARCHIVED_READ_ONLY } from '../campaigns/campaigns.service';
import { channelProblems, type ChannelNumbers } from './channel-rules';
import { ChannelEntity } from './channel.entity';
import { CHANNEL_FIELDS, channelSnapshot, normaliseAccuracy, toChannel } from './channel.mapper';
import { CreateChannelDto } from './dto/create-channel.dto';
import { ReorderChannelsDto } from './dto/reorder-channels.dto';
import { UpdateChannelDto } from './dto/update-channel.dto';

export const CHANNEL_NOT_FOUND = 'Channel not found';
/** Who may set up channels and their display regions. */
export const CHANNEL_WRITERS: readonly CampaignRole[] = ['lead', 'engineer'];

export const duplicateChannelName = (name: string) => `A channel named “${name}” already exists in this campaign`;

export const channelInUse = (sheet: string, run: string, sheets: number) =>
  `This channel is used by sheet “${sheet}” of run “${run}”${sheets > 1 ? ` and ${sheets - 1} other sheet${sheets > 2 ? 's' : ''}` : ''}; take it off ${sheets > 1 ? 'those sheets' : 'that sheet'} before deleting it`;

function isUniqueViolation(error: unknown, constraint: string): boolean {
  const driverError = error instanceof QueryFailedError ? (error.driverError as { code?: string; constraint?: string }) : null;
  return driverError?.code === '23505' && driverError.constraint === constraint;
}

function assertSound(numbers: ChannelNumbers): void {
  const problems = channelProblems(numbers);
  if (problems.length > 0) throw new BadRequestException(problems);
}

const sameValue = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);

@Injectable()
export class ChannelsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly access: CampaignAccessService,
    private readonly audit: AuditService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<Channel[]> {
    await this.access.require(user, campaignId);
    const rows = await this.ordered(this.dataSource.manager, campaignId);
    return rows.map(toChannel);
  }

  async create(user: AuthUser, campaignId: string, dto: CreateChannelDto): Promise<Channel> {
    const fields = {
      name: dto.name,
      symbol: dto.symbol,
      quantity: dto.quantity,
      rawUnit: dto.rawUnit,
      resolution: dto.resolution,
      rangeMin: dto.rangeMin,
      rangeMax: dto.rangeMax,
      fullScale: dto.fullScale ?? null,
      operatingMin: dto.operatingMin ?? null,
      operatingMax: dto.operatingMax ?? null,
      accuracy: normaliseAccuracy(dto.accuracy),
      plausibleMin: dto.plausibleMin ?? null,
      plausibleMax: dto.plausibleMax ?? null,
    };
    assertSound(fields);
    return this.withNameGuard(fields.name, () =>
      this.dataSource.transaction(async (manager) => {
        // The campaign row lock serialises writers, so name checks and positions cannot race.
        await this.requireWritableCampaign(user, campaignId, manager);
        await this.refuseDuplicateName(manager, campaignId, fields.name);
        const [{ next }] = (await manager.query(
          'SELECT coalesce(max(position) + 1, 0)::int AS next FROM channels WHERE campaign_id = $1',
          [campaignId],
        )) as Array<{ next: number }>;
        const channel = await manager.save(manager.create(ChannelEntity, { campaignId, ...fields, position: next }));
        await this.audit.record(manager, {
          campaignId,
          actorId: user.id,
          entityType: 'channel',
          entityId: channel.id,
          action: 'create',
          after: channelSnapshot(channel),
        });
        return toChannel(channel);
      }),
    );
  }

  async update(user: AuthUser, channelId: string, dto: UpdateChannelDto): Promise<Channel> {
    return this.withNameGuard(dto.name ?? '', () =>
      this.dataSource.transaction(async (manager) => {
        const channel = await this.requireChannel(user, channelId, manager);
        const merged = { ...channel };
        for (const key of CHANNEL_FIELDS) {
          const value = dto[key];
          if (value === undefined) continue;
          (merged as Record<string, unknown>)[key] = key === 'accuracy' ? normaliseAccuracy(dto.accuracy) : value;
        }
        assertSound(merged);
        const before: Record<string, unknown> = {};
        const after: Record<string, unknown> = {};
        const snapshot = channelSnapshot(channel);
        const next = channelSnapshot(merged);
        for (const key of CHANNEL_FIELDS) {
          if (!sameValue(snapshot[key], next[key])) {
            before[key] = snapshot[key];
            after[key] = next[key];
          }
        }
        if (Object.keys(after).length === 0) return toChannel(channel);
        if ('name' in after && merged.name.toLowerCase() !== channel.name.toLowerCase()) {
          await this.refuseDuplicateName(manager, channel.campaignId, merged.name);
        }
        const saved = await manager.save(ChannelEntity, merged);
        await this.audit.record(manager, {
          campaignId: channel.campaignId,
          actorId: user.id,
          entityType: 'channel',
          entityId: channel.id,
          action: 'update',
          before,
          after,
          reason: dto.reason,
        });
        return toChannel(saved);
      }),
    );
  }

  /** Removes the channel and, through the foreign key, its display regions in every run. */
  async remove(user: AuthUser, channelId: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const channel = await this.requireChannel(user, channelId, manager);
      // Sheets keep their channels by foreign key; say which sheet holds it rather than fail there.
      const [used] = (await manager.query(
        `SELECT s.name AS sheet, r.name AS run, count(*) OVER ()::int AS total
           FROM sheet_channels sc JOIN sheets s ON s.id = sc.sheet_id JOIN runs r ON r.id = s.run_id
          WHERE sc.channel_id = $1 ORDER BY s.created_at, s.id LIMIT 1`,
        [channel.id],
      )) as Array<{ sheet: string; run: string; total: number }>;
      if (used) throw new ConflictException(channelInUse(used.sheet, used.run, used.total));
      // Readings are part of the record: a channel with typed readings is never deleted.
      const [{ readings }] = (await manager.query('SELECT count(*)::int AS readings FROM readings WHERE channel_id = $1', [
        channel.id,
      ])) as Array<{ readings: number }>;
      if (readings > 0) {
        throw new ConflictException(`This channel has ${readings} reading${readings === 1 ? '' : 's'} on record; readings are never deleted, so neither is the channel`);
      }
      const [{ regions }] = (await manager.query('SELECT count(*)::int AS regions FROM display_regions WHERE channel_id = $1', [
        channel.id,
      ])) as Array<{ regions: number }>;
      await manager.delete(ChannelEntity, { id: channel.id });
      // Keep positions 0..n-1 so the order stays a plain list.
      await manager.query('UPDATE channels SET position = position - 1 WHERE campaign_id = $1 AND position > $2', [
        channel.campaignId,
        channel.position,
      ]);
      await this.audit.record(manager, {
        campaignId: channel.campaignId,
        actorId: user.id,
        entityType: 'channel',
        entityId: channel.id,
        action: 'delete',
        before: { ...channelSnapshot(channel), position: channel.position, displayRegions: regions },
      });
    });
  }

  async reorder(user: AuthUser, campaignId: string, dto: ReorderChannelsDto): Promise<Channel[]> {
    return this.dataSource.transaction(async (manager) => {
      await this.requireWritableCampaign(user, campaignId, manager);
      const channels = await this.ordered(manager, campaignId);
      const known = new Set(channels.map((c) => c.id));
      const wanted = new Set(dto.channelIds);
      if (wanted.size !== dto.channelIds.length) throw new BadRequestException('channelIds must not list a channel twice');
      if (wanted.size !== known.size || dto.channelIds.some((id) => !known.has(id))) {
        throw new BadRequestException(`channelIds must list every channel of this campaign exactly once (${known.size} channels)`);
      }
      const byId = new Map(channels.map((c) => [c.id, c]));
      const moved: ChannelEntity[] = [];
      for (const [position, id] of dto.channelIds.entries()) {
        const channel = byId.get(id) as ChannelEntity;
        if (channel.position === position) continue;
        await this.audit.record(manager, {
          campaignId,
          actorId: user.id,
          entityType: 'channel',
          entityId: id,
          action: 'update',
          before: { position: channel.position },
          after: { position },
          reason: 'Channels reordered',
        });
        channel.position = position;
        moved.push(channel);
      }
      // The (campaign, position) key is checked at commit, so swaps in between are fine.
      for (const channel of moved) await manager.update(ChannelEntity, { id: channel.id }, { position: channel.position });
      return (await this.ordered(manager, campaignId)).map(toChannel);
    });
  }

  private ordered(manager: EntityManager, campaignId: string): Promise<ChannelEntity[]> {
    return manager.find(ChannelEntity, { where: { campaignId }, order: { position: 'ASC', id: 'ASC' } });
  }

  private async requireWritableCampaign(user: AuthUser, campaignId: string, manager: EntityManager): Promise<CampaignAccess> {
    const access = await this.access.require(user, campaignId, CHANNEL_WRITERS, { manager, lock: true });
    if (access.campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
    return access;
  }

  /**
   * For changes to one channel. A channel in a campaign the caller does not belong to is "not
   * found", like an unknown id.
   */
  private async requireChannel(user: AuthUser, channelId: string, manager: EntityManager): Promise<ChannelEntity> {
    if (!isUUID(channelId)) throw new NotFoundException(CHANNEL_NOT_FOUND);
    const found = await manager.findOneBy(ChannelEntity, { id: channelId });
    if (!found) throw new NotFoundException(CHANNEL_NOT_FOUND);
    try {
      await this.requireWritableCampaign(user, found.campaignId, manager);
    } catch (error) {
      if (error instanceof NotFoundException) throw new NotFoundException(CHANNEL_NOT_FOUND);
      throw error;
    }
    // Read again under the campaign lock: a concurrent writer may have moved or removed it.
    const channel = await manager.findOneBy(ChannelEntity, { id: channelId });
    if (!channel) throw new NotFoundException(CHANNEL_NOT_FOUND);
    return channel;
  }

  private async refuseDuplicateName(manager: EntityManager, campaignId: string, name: string): Promise<void> {
    const clash = await manager
      .createQueryBuilder(ChannelEntity, 'c')
      .where('c.campaign_id = :campaignId', { campaignId })
      .andWhere('lower(c.name) = lower(:name)', { name })
      .getExists();
    if (clash) throw new ConflictException(duplicateChannelName(name));
  }

  /** The unique index settles what the pre-check cannot see (a writer outside the lock). */
  private async withNameGuard<T>(name: string, work: () => Promise<T>): Promise<T> {
    try {
      return await work();
    } catch (error) {
      if (isUniqueViolation(error, 'channels_campaign_name_key')) throw new ConflictException(duplicateChannelName(name));
      throw error;
    }
  }
}

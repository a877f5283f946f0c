import type { DisplayRegion } from '@dialsheet/common';
import { BadRequestException, Injectable } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, EntityManager, In } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { RunAccessService } from '../runs/run-access.service';
import { regionProblems } from './channel-rules';
import { ChannelEntity } from './channel.entity';
import { toDisplayRegion } from './channel.mapper';
import { CHANNEL_WRITERS } from './channels.service';
import { DisplayRegionEntity } from './display-region.entity';
import { SetDisplayRegionsDto } from './dto/set-display-regions.dto';

type Box = Omit<DisplayRegion, 'runId'>;

const box = (r: Box): Box => ({ channelId: r.channelId, x: r.x, y: r.y, width: r.width, height: r.height });

@Injectable()
export class DisplayRegionsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly runAccess: RunAccessService,
    private readonly audit: AuditService,
  ) {}

  async list(user: AuthUser, runId: string): Promise<DisplayRegion[]> {
    await this.runAccess.require(user, runId);
    return (await this.ordered(this.dataSource.manager, runId)).map(toDisplayRegion);
  }

  /** Replaces the run's whole set, so the screen that draws them sends exactly what it shows. */
  async replace(user: AuthUser, runId: string, dto: SetDisplayRegionsDto): Promise<DisplayRegion[]> {
    const problems = dto.regions.flatMap((r, i) => regionProblems(r, `regions.${i}`));
    const seen = new Set<string>();
    dto.regions.forEach((r, i) => {
      if (seen.has(r.channelId)) problems.push(`regions.${i}.channelId: the channel already has a region in this request`);
      seen.add(r.channelId);
    });
    if (problems.length > 0) throw new BadRequestException(problems);

    return this.dataSource.transaction(async (manager) => {
      const { run } = await this.runAccess.require(user, runId, CHANNEL_WRITERS, { manager, lock: true, writable: true });
      const ids = dto.regions.map((r) => r.channelId);
      const channels = ids.length ? await manager.find(ChannelEntity, { where: { id: In(ids), campaignId: run.campaignId } }) : [];
      const ours = new Set(channels.map((c) => c.id));
      const foreign = dto.regions.flatMap((r, i) => (ours.has(r.channelId) ? [] : [`regions.${i}.channelId is not a channel of this run’s campaign`]));
      if (foreign.length > 0) throw new BadRequestException(foreign);

      const before = (await this.ordered(manager, runId)).map(box);
      await manager.delete(DisplayRegionEntity, { runId });
      if (dto.regions.length > 0) {
        await manager.insert(
          DisplayRegionEntity,
          dto.regions.map((r) => ({ runId, ...box(r) })),
        );
      }
      const saved = await this.ordered(manager, runId);
      const after = saved.map(box);
      if (JSON.stringify(before) !== JSON.stringify(after)) {
        await this.audit.record(manager, {
          campaignId: run.campaignId,
          actorId: user.id,
          entityType: 'display-region',
          entityId: runId,
          action: 'update',
          before: { regions: before },
          after: { regions: after },
          reason: dto.reason,
        });
      }
      return saved.map(toDisplayRegion);
    });
  }

  /** In the channels' order, so the entry screen can lay the crops out as it lists inputs. */
  private ordered(manager: EntityManager, runId: string): Promise<DisplayRegionEntity[]> {
    return manager
      .createQueryBuilder(DisplayRegionEntity, 'r')
      .innerJoin(ChannelEntity, 'c', 'c.id = r.channel_id')
      .where('r.run_id = :runId', { runId })
      .orderBy('c.position', 'ASC')
      .addOrderBy('c.id', 'ASC')
      .getMany();
  }
}

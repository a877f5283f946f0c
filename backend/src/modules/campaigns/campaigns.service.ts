import type { Campaign, CampaignStatus } from '@dialsheet/common';
import { ConflictException, Injectable } from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { DataSource, EntityManager, In, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService } from './campaign-access.service';
import { CampaignMemberEntity } from './campaign-member.entity';
import { CampaignEntity } from './campaign.entity';
import { campaignSnapshot, toCampaign } from './campaign.mapper';
import { CreateCampaignDto } from './dto/create-campaign.dto';
import { UpdateCampaignDto } from './dto/update-campaign.dto';

export const ARCHIVED_READ_ONLY = 'This campaign is archived and read-only; restore it first';

@Injectable()
export class CampaignsService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    @InjectRepository(CampaignMemberEntity) private readonly members: Repository<CampaignMemberEntity>,
    private readonly access: CampaignAccessService,
    private readonly audit: AuditService,
  ) {}

  /** Only campaigns the caller belongs to; membership is the filter, so no access call is needed. */
  async list(user: AuthUser, status: CampaignStatus = 'active'): Promise<Campaign[]> {
    const mine = await this.members.find({
      where: { userId: user.id, campaign: { status } },
      relations: { campaign: true },
      order: { campaign: { createdAt: 'DESC' } },
    });
    const counts = await this.memberCounts(
      this.dataSource.manager,
      mine.map((m) => m.campaignId),
    );
    return mine.map((m) => toCampaign(m.campaign as CampaignEntity, m.roles, counts.get(m.campaignId) ?? 0));
  }

  async get(user: AuthUser, campaignId: string): Promise<Campaign> {
    const { campaign, member } = await this.access.require(user, campaignId);
    return this.present(this.dataSource.manager, campaign, member);
  }

  async create(user: AuthUser, dto: CreateCampaignDto): Promise<Campaign> {
    return this.dataSource.transaction(async (manager) => {
      const campaign = await manager.save(
        manager.create(CampaignEntity, {
          name: dto.name,
          description: dto.description ?? '',
          decimalComma: dto.decimalComma ?? false,
          status: 'active',
          createdById: user.id,
        }),
      );
      const member = await manager.save(
        manager.create(CampaignMemberEntity, { campaignId: campaign.id, userId: user.id, roles: ['lead'] }),
      );
      const common = { campaignId: campaign.id, actorId: user.id };
      await this.audit.record(manager, {
        ...common,
        entityType: 'campaign',
        entityId: campaign.id,
        action: 'create',
        after: campaignSnapshot(campaign),
      });
      await this.audit.record(manager, {
        ...common,
        entityType: 'member',
        entityId: user.id,
        action: 'join',
        after: { email: user.email, name: user.name, roles: member.roles },
      });
      return toCampaign(campaign, member.roles, 1);
    });
  }

  async update(user: AuthUser, campaignId: string, dto: UpdateCampaignDto): Promise<Campaign> {
    return this.dataSource.transaction(async (manager) => {
      const { campaign, member } = await this.access.require(user, campaignId, ['lead'], { manager, lock: true });
      if (campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      const before: Record<string, unknown> = {};
      const after: Record<string, unknown> = {};
      for (const key of ['name', 'description', 'decimalComma'] as const) {
        const value = dto[key];
        if (value !== undefined && value !== campaign[key]) {
          before[key] = campaign[key];
          after[key] = value;
        }
      }
      // An edit that changes nothing is not an event worth a row in the trail.
      if (Object.keys(after).length === 0) return this.present(manager, campaign, member);
      Object.assign(campaign, after);
      const saved = await manager.save(campaign);
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'campaign',
        entityId: campaignId,
        action: 'update',
        before,
        after,
        reason: dto.reason,
      });
      return this.present(manager, saved, member);
    });
  }

  archive(user: AuthUser, campaignId: string, reason?: string): Promise<Campaign> {
    return this.setStatus(user, campaignId, 'archived', reason);
  }

  restore(user: AuthUser, campaignId: string, reason?: string): Promise<Campaign> {
    return this.setStatus(user, campaignId, 'active', reason);
  }

  private async setStatus(
    user: AuthUser,
    campaignId: string,
    status: CampaignStatus,
    reason: string | undefined,
  ): Promise<Campaign> {
    return this.dataSource.transaction(async (manager) => {
      const { campaign, member } = await this.access.require(user, campaignId, ['lead'], { manager, lock: true });
      if (campaign.status === status) {
        throw new ConflictException(`This campaign is already ${status === 'archived' ? 'archived' : 'active'}`);
      }
      const before = { status: campaign.status };
      campaign.status = status;
      campaign.archivedAt = status === 'archived' ? new Date() : null;
      const saved = await manager.save(campaign);
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'campaign',
        entityId: campaignId,
        action: status === 'archived' ? 'archive' : 'restore',
        before,
        after: { status },
        reason,
      });
      return this.present(manager, saved, member);
    });
  }

  private async present(
    manager: EntityManager,
    campaign: CampaignEntity,
    member: CampaignMemberEntity,
  ): Promise<Campaign> {
    const counts = await this.memberCounts(manager, [campaign.id]);
    return toCampaign(campaign, member.roles, counts.get(campaign.id) ?? 0);
  }

  private async memberCounts(manager: EntityManager, campaignIds: string[]): Promise<Map<string, number>> {
    if (campaignIds.length === 0) return new Map();
    const rows = await manager
      .getRepository(CampaignMemberEntity)
      .createQueryBuilder('m')
      .select('m.campaign_id', 'campaignId')
      .addSelect('count(*)::int', 'count')
      .where({ campaignId: In(campaignIds) })
      .groupBy('m.campaign_id')
      .getRawMany<{ campaignId: string; count: number }>();
    return new Map(rows.map((r) => [r.campaignId, Number(r.count)]));
  }
}

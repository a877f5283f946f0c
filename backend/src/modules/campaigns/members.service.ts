import type { CampaignMember, CampaignRole } from '@dialsheet/common';
import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectDataSource, InjectRepository } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { DataSource, EntityManager, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { AuditService } from '../audit/audit.service';
import { CampaignAccessService } from './campaign-access.service';
import { CampaignMemberEntity } from './campaign-member.entity';
import { sortRoles, toCampaignMember } from './campaign.mapper';
import { ARCHIVED_READ_ONLY } from './campaigns.service';
import { UpdateMemberRolesDto } from './dto/update-member-roles.dto';

export const LAST_LEAD =
  'A campaign needs at least one lead: make someone else lead before changing or removing the last one';

@Injectable()
export class MembersService {
  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    @InjectRepository(CampaignMemberEntity) private readonly members: Repository<CampaignMemberEntity>,
    private readonly access: CampaignAccessService,
    private readonly audit: AuditService,
  ) {}

  async list(user: AuthUser, campaignId: string): Promise<CampaignMember[]> {
    await this.access.require(user, campaignId);
    const members = await this.members.find({
      where: { campaignId },
      relations: { user: true },
      order: { user: { name: 'ASC', email: 'ASC' } },
    });
    return members.map(toCampaignMember);
  }

  async updateRoles(
    user: AuthUser,
    campaignId: string,
    userId: string,
    dto: UpdateMemberRolesDto,
  ): Promise<CampaignMember> {
    return this.dataSource.transaction(async (manager) => {
      // The campaign row lock serialises concurrent role changes, so two leads cannot demote
      // each other at the same moment and leave the campaign without one.
      const { campaign } = await this.access.require(user, campaignId, ['lead'], { manager, lock: true });
      if (campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      const target = await this.findMember(manager, campaignId, userId);
      const roles = sortRoles(dto.roles);
      if (target.roles.includes('lead') && !roles.includes('lead')) await this.ensureAnotherLead(manager, campaignId);
      const before = sortRoles(target.roles);
      if (before.join() !== roles.join()) {
        target.roles = roles;
        await manager.save(target);
        await this.audit.record(manager, {
          campaignId,
          actorId: user.id,
          entityType: 'member',
          entityId: userId,
          action: 'update',
          before: { roles: before },
          after: { roles },
          reason: dto.reason,
        });
      }
      return toCampaignMember(target);
    });
  }

  async remove(user: AuthUser, campaignId: string, userId: string): Promise<void> {
    await this.dataSource.transaction(async (manager) => {
      const { campaign } = await this.access.require(user, campaignId, ['lead'], { manager, lock: true });
      if (campaign.status === 'archived') throw new ConflictException(ARCHIVED_READ_ONLY);
      const target = await this.findMember(manager, campaignId, userId);
      if (target.roles.includes('lead')) await this.ensureAnotherLead(manager, campaignId);
      await manager.delete(CampaignMemberEntity, { id: target.id });
      await this.audit.record(manager, {
        campaignId,
        actorId: user.id,
        entityType: 'member',
        entityId: userId,
        action: 'delete',
        before: { email: target.user?.email, name: target.user?.name, roles: sortRoles(target.roles) },
      });
    });
  }

  private async findMember(manager: EntityManager, campaignId: string, userId: string) {
    const member = isUUID(userId)
      ? await manager.findOne(CampaignMemberEntity, { where: { campaignId, userId }, relations: { user: true } })
      : null;
    if (!member) throw new NotFoundException('This person is not a member of the campaign');
    return member;
  }

  private async ensureAnotherLead(manager: EntityManager, campaignId: string): Promise<void> {
    const leads = await manager
      .getRepository(CampaignMemberEntity)
      .createQueryBuilder('m')
      .where('m.campaign_id = :campaignId', { campaignId })
      .andWhere(`:lead = ANY(m.roles)`, { lead: 'lead' satisfies CampaignRole })
      .getCount();
    if (leads <= 1) throw new ConflictException(LAST_LEAD);
  }
}

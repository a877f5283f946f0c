import { CAMPAIGN_ROLE_LABELS, type CampaignRole } from '@dialsheet/common';
import { ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { isUUID } from 'class-validator';
import { EntityManager, Repository } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { CampaignMemberEntity } from './campaign-member.entity';
import { CampaignEntity } from './campaign.entity';

export interface CampaignAccess {
  campaign: CampaignEntity;
  member: CampaignMemberEntity;
}

export interface AccessOptions {
  /** Check inside this transaction. */
  manager?: EntityManager;
  /** Lock the campaign row (needs `manager`) so membership invariants hold until commit. */
  lock?: boolean;
}

export const CAMPAIGN_NOT_FOUND = 'Campaign not found';

/**
 * The one place that decides who may touch a campaign. Every service method that reads or writes
 * campaign data calls `require` first. Non-members get the same 404 as for an unknown id, so
 * campaign ids reveal nothing; a member without the needed role gets 403. Platform
 * administrators get no implicit rights here.
 */
@Injectable()
export class CampaignAccessService {
  constructor(
    @InjectRepository(CampaignEntity) private readonly campaigns: Repository<CampaignEntity>,
    @InjectRepository(CampaignMemberEntity) private readonly members: Repository<CampaignMemberEntity>,
  ) {}

  /** `roles`: the caller needs at least one of them; empty means any member. */
  async require(
    user: AuthUser,
    campaignId: string,
    roles: readonly CampaignRole[] = [],
    options: AccessOptions = {},
  ): Promise<CampaignAccess> {
    if (!isUUID(campaignId)) throw new NotFoundException(CAMPAIGN_NOT_FOUND);
    const campaigns = options.manager?.getRepository(CampaignEntity) ?? this.campaigns;
    const members = options.manager?.getRepository(CampaignMemberEntity) ?? this.members;
    const campaign = await campaigns.findOne({
      where: { id: campaignId },
      ...(options.lock && options.manager ? { lock: { mode: 'pessimistic_write' as const } } : {}),
    });
    if (!campaign) throw new NotFoundException(CAMPAIGN_NOT_FOUND);
    const member = await members.findOneBy({ campaignId, userId: user.id });
    return CampaignAccessService.decide(campaign, member, roles);
  }

  /**
   * The decision itself, for a hot path that reads the campaign and the caller's membership in
   * its own statement (the save route). `notFound` is the message a non-member gets, e.g. the
   * sheet's own "not found" when the caller asked for a sheet.
   */
  static decide(
    campaign: CampaignEntity | null,
    member: CampaignMemberEntity | null,
    roles: readonly CampaignRole[] = [],
    notFound = CAMPAIGN_NOT_FOUND,
  ): CampaignAccess {
    if (!campaign || !member) throw new NotFoundException(notFound);
    if (roles.length > 0 && !roles.some((r) => member.roles.includes(r))) {
      const needed = roles.map((r) => CAMPAIGN_ROLE_LABELS[r]).join(' or ');
      throw new ForbiddenException(`This needs the ${needed} role in this campaign`);
    }
    return { campaign, member };
  }
}

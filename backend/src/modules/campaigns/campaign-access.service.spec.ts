import { ForbiddenException, NotFoundException } from '@nestjs/common';
import type { Repository } from 'typeorm';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { AuthUser } from '../../core/auth-user';
import { CampaignAccessService } from './campaign-access.service';
import { CampaignMemberEntity } from './campaign-member.entity';
import { CampaignEntity } from './campaign.entity';

const campaignId = '0b8e6c1e-3f0e-4d8e-9a51-2c7d1f2e9a01';
const user: AuthUser = {
  id: 'c3a1f1de-5f44-4b1c-8d8e-6a4f0f1e2b3c',
  email: 'eve@example.test',
  name: 'Eve',
  isAdmin: false,
  jti: '9d7f8e6a-1b2c-4d3e-8f9a-0b1c2d3e4f5a',
  exp: 0,
};

function campaign(): CampaignEntity {
  return Object.assign(new CampaignEntity(), { id: campaignId, name: 'Bench', status: 'active' });
}

function member(roles: CampaignMemberEntity['roles']): CampaignMemberEntity {
  return Object.assign(new CampaignMemberEntity(), { campaignId, userId: user.id, roles });
}

describe('CampaignAccessService', () => {
  const campaigns = { findOne: vi.fn() };
  const members = { findOneBy: vi.fn() };
  let access: CampaignAccessService;

  beforeEach(() => {
    campaigns.findOne.mockReset();
    members.findOneBy.mockReset();
    access = new CampaignAccessService(
      campaigns as unknown as Repository<CampaignEntity>,
      members as unknown as Repository<CampaignMemberEntity>,
    );
  });

  it('answers 404 for an id that is not a UUID without querying', async () => {
    await expect(access.require(user, 'not-a-uuid')).rejects.toBeInstanceOf(NotFoundException);
    expect(campaigns.findOne).not.toHaveBeenCalled();
  });

  it('answers 404 for an unknown campaign', async () => {
    campaigns.findOne.mockResolvedValue(null);
    await expect(access.require(user, campaignId)).rejects.toThrow(new NotFoundException('Campaign not found'));
  });

  it('answers the same 404 to a non-member, even a platform administrator', async () => {
    campaigns.findOne.mockResolvedValue(campaign());
    members.findOneBy.mockResolvedValue(null);
    await expect(access.require({ ...user, isAdmin: true }, campaignId)).rejects.toThrow(
      new NotFoundException('Campaign not found'),
    );
    expect(members.findOneBy).toHaveBeenCalledWith({ campaignId, userId: user.id });
  });

  it('answers 403 naming the role when the member lacks it', async () => {
    campaigns.findOne.mockResolvedValue(campaign());
    members.findOneBy.mockResolvedValue(member(['reader', 'checker']));
    const attempt = access.require(user, campaignId, ['lead']);
    await expect(attempt).rejects.toBeInstanceOf(ForbiddenException);
    await expect(access.require(user, campaignId, ['lead', 'engineer'])).rejects.toThrow(
      'This needs the Lead or Engineer role in this campaign',
    );
  });

  it('lets a member with any of the roles through and returns campaign and membership', async () => {
    campaigns.findOne.mockResolvedValue(campaign());
    members.findOneBy.mockResolvedValue(member(['reader', 'engineer']));
    const result = await access.require(user, campaignId, ['lead', 'engineer']);
    expect(result.campaign.id).toBe(campaignId);
    expect(result.member.roles).toEqual(['reader', 'engineer']);
  });

  it('lets any member through when no role is asked for', async () => {
    campaigns.findOne.mockResolvedValue(campaign());
    members.findOneBy.mockResolvedValue(member(['reader']));
    await expect(access.require(user, campaignId)).resolves.toMatchObject({ member: { roles: ['reader'] } });
  });
});

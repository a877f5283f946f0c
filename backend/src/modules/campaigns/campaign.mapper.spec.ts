import { describe, expect, it } from 'vitest';
import { UserEntity } from '../users/user.entity';
import { CampaignMemberEntity } from './campaign-member.entity';
import { CampaignEntity } from './campaign.entity';
import { campaignSnapshot, sortRoles, toCampaign, toCampaignMember } from './campaign.mapper';

const campaign = Object.assign(new CampaignEntity(), {
  id: '0b8e6c1e-3f0e-4d8e-9a51-2c7d1f2e9a01',
  name: 'Core test',
  description: 'Two streams',
  decimalComma: true,
  status: 'active' as const,
  archivedAt: null,
  createdById: 'c3a1f1de-5f44-4b1c-8d8e-6a4f0f1e2b3c',
  createdAt: new Date('2025-01-02T03:04:05.000Z'),
  updatedAt: new Date('2025-01-03T03:04:05.000Z'),
});

describe('toCampaign', () => {
  it("maps the wire fields with the caller's roles in canonical order and the member count", () => {
    expect(toCampaign(campaign, ['lead', 'reader'], 4)).toEqual({
      id: campaign.id,
      name: 'Core test',
      description: 'Two streams',
      decimalComma: true,
      status: 'active',
      createdAt: '2025-01-02T03:04:05.000Z',
      updatedAt: '2025-01-03T03:04:05.000Z',
      myRoles: ['reader', 'lead'],
      memberCount: 4,
    });
  });
});

describe('toCampaignMember', () => {
  it('takes name and e-mail from the user', () => {
    const member = Object.assign(new CampaignMemberEntity(), {
      userId: 'u1',
      roles: ['engineer', 'checker'],
      joinedAt: new Date('2025-02-01T00:00:00.000Z'),
      user: Object.assign(new UserEntity(), { email: 'e@x.test', name: 'Evan' }),
    });
    expect(toCampaignMember(member)).toEqual({
      userId: 'u1',
      email: 'e@x.test',
      name: 'Evan',
      roles: ['checker', 'engineer'],
      joinedAt: '2025-02-01T00:00:00.000Z',
    });
  });

  it('refuses to guess when the user is not loaded', () => {
    expect(() => toCampaignMember(new CampaignMemberEntity())).toThrow('user relation');
  });
});

describe('campaignSnapshot and sortRoles', () => {
  it('records only the editable fields', () => {
    expect(campaignSnapshot(campaign)).toEqual({
      name: 'Core test',
      description: 'Two streams',
      decimalComma: true,
      status: 'active',
    });
  });

  it('drops nothing and orders reader, checker, engineer, lead', () => {
    expect(sortRoles(['lead', 'checker', 'reader', 'engineer'])).toEqual(['reader', 'checker', 'engineer', 'lead']);
  });
});

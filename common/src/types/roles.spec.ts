import { describe, expect, it } from 'vitest';
import { CAMPAIGN_ROLES, CAMPAIGN_ROLE_LABELS, isCampaignRole } from './roles';

describe('campaign roles', () => {
  it('accepts exactly the four roles of DESIGN.md §2', () => {
    expect([...CAMPAIGN_ROLES].sort()).toEqual(['checker', 'engineer', 'lead', 'reader']);
    for (const role of CAMPAIGN_ROLES) expect(isCampaignRole(role)).toBe(true);
  });

  it('refuses anything else, including near misses and non-strings', () => {
    for (const value of ['admin', 'Lead', ' reader', '', null, undefined, 3, ['lead']]) {
      expect(isCampaignRole(value)).toBe(false);
    }
  });

  it('has a label for every role', () => {
    expect(Object.keys(CAMPAIGN_ROLE_LABELS).sort()).toEqual([...CAMPAIGN_ROLES].sort());
  });
});

/** Roles are held per campaign; one person may hold several in the same campaign. */
export const CAMPAIGN_ROLES = ['reader', 'checker', 'engineer', 'lead'] as const;
export type CampaignRole = (typeof CAMPAIGN_ROLES)[number];

export function isCampaignRole(value: unknown): value is CampaignRole {
  return typeof value === 'string' && (CAMPAIGN_ROLES as readonly string[]).includes(value);
}

/** Human labels shown in the UI. */
export const CAMPAIGN_ROLE_LABELS: Record<CampaignRole, string> = {
  reader: 'Reader',
  checker: 'Checker',
  engineer: 'Engineer',
  lead: 'Lead',
};

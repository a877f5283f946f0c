import type { CampaignRole } from '@dialsheet/common';

// What each campaign role may do here. The server decides; these only keep buttons away from
// people who would be refused.

/** Lead: signs, declines, releases at once, opens corrections. */
export const maySign = (roles: readonly CampaignRole[]) => roles.includes('lead');

/** Engineer (or lead): asks for a release. */
export const mayRequest = (roles: readonly CampaignRole[]) => roles.includes('lead') || roles.includes('engineer');

/**
 * Live data before sign-off may hold first-pass values a checker must not see before finishing
 * pass 2 (blind double entry), so draft exports and the dashboard are for leads and engineers.
 */
export const mayOversee = (roles: readonly CampaignRole[]) => roles.includes('lead') || roles.includes('engineer');

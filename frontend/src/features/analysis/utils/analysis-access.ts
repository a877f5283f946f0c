import type { CampaignRole } from '@dialsheet/common';

/** The engineer sets up calibrations, rules and analyses; everyone else in the campaign reads them. */
export function mayEditAnalysis(roles: readonly CampaignRole[]): boolean {
  return roles.includes('engineer');
}

/** The series behind a chart (every reading of a channel) is for the lead and the engineer. */
export function mayReadSeries(roles: readonly CampaignRole[]): boolean {
  return roles.includes('engineer') || roles.includes('lead');
}

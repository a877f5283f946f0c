import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CampaignMember } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getMembers = (campaignId: string): Promise<CampaignMember[]> =>
  api.get<CampaignMember[]>(`/campaigns/${campaignId}/members`);

export const getMembersQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['campaigns', campaignId, 'members'], queryFn: () => getMembers(campaignId) });

export function useMembers({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getMembersQueryOptions>;
}) {
  return useQuery({ ...getMembersQueryOptions(campaignId), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Campaign } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getCampaign = (campaignId: string): Promise<Campaign> => api.get<Campaign>(`/campaigns/${campaignId}`);

export const getCampaignQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['campaigns', campaignId], queryFn: () => getCampaign(campaignId) });

export function useCampaign({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getCampaignQueryOptions>;
}) {
  return useQuery({ ...getCampaignQueryOptions(campaignId), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CampaignDashboard } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getDashboard = (campaignId: string): Promise<CampaignDashboard> =>
  api.get<CampaignDashboard>(`/campaigns/${campaignId}/dashboard`);

export const getDashboardQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['releases', 'dashboard', campaignId], queryFn: () => getDashboard(campaignId) });

export function useDashboard({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getDashboardQueryOptions>;
}) {
  return useQuery({ ...getDashboardQueryOptions(campaignId), ...queryConfig });
}

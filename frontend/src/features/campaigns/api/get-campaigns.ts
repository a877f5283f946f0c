import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Campaign, CampaignStatus } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getCampaigns = (status: CampaignStatus = 'active'): Promise<Campaign[]> =>
  api.get<Campaign[]>('/campaigns', { params: { status: status === 'archived' ? 'archived' : undefined } });

export const getCampaignsQueryOptions = (status: CampaignStatus = 'active') =>
  queryOptions({ queryKey: ['campaigns', { status }], queryFn: () => getCampaigns(status) });

export function useCampaigns({
  status = 'active',
  queryConfig,
}: { status?: CampaignStatus; queryConfig?: QueryConfig<typeof getCampaignsQueryOptions> } = {}) {
  return useQuery({ ...getCampaignsQueryOptions(status), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Channel } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getChannels = (campaignId: string): Promise<Channel[]> => api.get<Channel[]>(`/campaigns/${campaignId}/channels`);

export const getChannelsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['channels', 'list', campaignId], queryFn: () => getChannels(campaignId) });

export function useChannels({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getChannelsQueryOptions>;
}) {
  return useQuery({ ...getChannelsQueryOptions(campaignId), ...queryConfig });
}

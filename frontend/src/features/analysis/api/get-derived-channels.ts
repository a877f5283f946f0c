import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DerivedChannel } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getDerivedChannels = (campaignId: string): Promise<DerivedChannel[]> =>
  api.get<DerivedChannel[]>(`/campaigns/${campaignId}/derived-channels`);

export const getDerivedChannelsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['derived-channels', 'list', campaignId], queryFn: () => getDerivedChannels(campaignId) });

export function useDerivedChannels({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getDerivedChannelsQueryOptions>;
}) {
  return useQuery({ ...getDerivedChannelsQueryOptions(campaignId), ...queryConfig });
}

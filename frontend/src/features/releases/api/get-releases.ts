import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Release } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getReleases = (campaignId: string): Promise<Release[]> => api.get<Release[]>(`/campaigns/${campaignId}/releases`);

export const getReleasesQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['releases', 'list', campaignId], queryFn: () => getReleases(campaignId) });

export function useReleases({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getReleasesQueryOptions>;
}) {
  return useQuery({ ...getReleasesQueryOptions(campaignId), ...queryConfig });
}

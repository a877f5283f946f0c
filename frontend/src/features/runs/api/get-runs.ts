import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Run } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getRuns = (campaignId: string): Promise<Run[]> => api.get<Run[]>(`/campaigns/${campaignId}/runs`);

export const getRunsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['runs', 'list', campaignId], queryFn: () => getRuns(campaignId) });

export function useRuns({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getRunsQueryOptions>;
}) {
  return useQuery({ ...getRunsQueryOptions(campaignId), ...queryConfig });
}

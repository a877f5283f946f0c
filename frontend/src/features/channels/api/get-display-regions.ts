import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DisplayRegion } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getDisplayRegions = (runId: string): Promise<DisplayRegion[]> => api.get<DisplayRegion[]>(`/runs/${runId}/display-regions`);

export const getDisplayRegionsQueryOptions = (runId: string) =>
  queryOptions({ queryKey: ['display-regions', runId], queryFn: () => getDisplayRegions(runId) });

export function useDisplayRegions({
  runId,
  queryConfig,
}: {
  runId: string;
  queryConfig?: QueryConfig<typeof getDisplayRegionsQueryOptions>;
}) {
  return useQuery({ ...getDisplayRegionsQueryOptions(runId), ...queryConfig });
}

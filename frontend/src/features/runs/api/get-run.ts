import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Run } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getRun = (runId: string): Promise<Run> => api.get<Run>(`/runs/${runId}`);

export const getRunQueryOptions = (runId: string) =>
  queryOptions({ queryKey: ['runs', 'detail', runId], queryFn: () => getRun(runId) });

export function useRun({ runId, queryConfig }: { runId: string; queryConfig?: QueryConfig<typeof getRunQueryOptions> }) {
  return useQuery({ ...getRunQueryOptions(runId), ...queryConfig });
}

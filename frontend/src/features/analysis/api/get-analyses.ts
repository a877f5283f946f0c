import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Analysis, AnalysisKind } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export interface AnalysesFilter {
  runId?: string;
  kind?: AnalysisKind;
}

export const getAnalyses = (campaignId: string, filter: AnalysesFilter = {}): Promise<Analysis[]> =>
  api.get<Analysis[]>(`/campaigns/${campaignId}/analyses`, { params: { runId: filter.runId, kind: filter.kind } });

export const getAnalysesQueryOptions = (campaignId: string, filter: AnalysesFilter = {}) =>
  queryOptions({
    queryKey: ['analyses', 'list', campaignId, filter.runId ?? null, filter.kind ?? null],
    queryFn: () => getAnalyses(campaignId, filter),
  });

export function useAnalyses({
  campaignId,
  filter,
  queryConfig,
}: {
  campaignId: string;
  filter?: AnalysesFilter;
  queryConfig?: QueryConfig<typeof getAnalysesQueryOptions>;
}) {
  return useQuery({ ...getAnalysesQueryOptions(campaignId, filter), ...queryConfig });
}

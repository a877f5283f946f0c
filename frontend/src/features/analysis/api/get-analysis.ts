import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Analysis } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getAnalysis = (analysisId: string): Promise<Analysis> => api.get<Analysis>(`/analyses/${analysisId}`);

export const getAnalysisQueryOptions = (analysisId: string) =>
  queryOptions({ queryKey: ['analyses', 'one', analysisId], queryFn: () => getAnalysis(analysisId) });

export function useAnalysis({ analysisId, queryConfig }: { analysisId: string; queryConfig?: QueryConfig<typeof getAnalysisQueryOptions> }) {
  return useQuery({ ...getAnalysisQueryOptions(analysisId), enabled: analysisId !== '', ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Analysis } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

// The stable values and balances as a published release froze them (read from its snapshot, its
// hash checked by the server): they never change, so they are never fetched again.
export const getReleaseAnalyses = (releaseId: string): Promise<Analysis[]> => api.get<Analysis[]>(`/releases/${releaseId}/analyses`);

export const getReleaseAnalysesQueryOptions = (releaseId: string) =>
  queryOptions({ queryKey: ['releases', 'analyses', releaseId], queryFn: () => getReleaseAnalyses(releaseId), staleTime: Infinity });

export function useReleaseAnalyses({ releaseId, queryConfig }: { releaseId: string; queryConfig?: QueryConfig<typeof getReleaseAnalysesQueryOptions> }) {
  return useQuery({ ...getReleaseAnalysesQueryOptions(releaseId), ...queryConfig });
}

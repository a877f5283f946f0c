import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Release } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getRelease = (releaseId: string): Promise<Release> => api.get<Release>(`/releases/${releaseId}`);

export const getReleaseQueryOptions = (releaseId: string) =>
  queryOptions({ queryKey: ['releases', 'one', releaseId], queryFn: () => getRelease(releaseId) });

export function useRelease({ releaseId, queryConfig }: { releaseId: string; queryConfig?: QueryConfig<typeof getReleaseQueryOptions> }) {
  return useQuery({ ...getReleaseQueryOptions(releaseId), ...queryConfig });
}

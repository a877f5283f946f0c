import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ChannelSeries } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

// The readings behind a stable value, for the report's trend charts (leads and engineers only).
export const getRunSeries = (runId: string, channelId: string): Promise<ChannelSeries> =>
  api.get<ChannelSeries>(`/runs/${runId}/series/${channelId}`);

export const getRunSeriesQueryOptions = (runId: string, channelId: string) =>
  queryOptions({ queryKey: ['series', runId, channelId], queryFn: () => getRunSeries(runId, channelId) });

export function useRunSeries({
  runId,
  channelId,
  queryConfig,
}: {
  runId: string;
  channelId: string;
  queryConfig?: QueryConfig<typeof getRunSeriesQueryOptions>;
}) {
  return useQuery({ ...getRunSeriesQueryOptions(runId, channelId), ...queryConfig });
}

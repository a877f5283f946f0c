import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ChannelSeries } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getChannelSeries = (runId: string, channelId: string): Promise<ChannelSeries> =>
  api.get<ChannelSeries>(`/runs/${runId}/series/${channelId}`);

export const getChannelSeriesQueryOptions = (runId: string, channelId: string) =>
  queryOptions({ queryKey: ['series', runId, channelId], queryFn: () => getChannelSeries(runId, channelId) });

export function useChannelSeries({
  runId,
  channelId,
  queryConfig,
}: {
  runId: string;
  channelId: string;
  queryConfig?: QueryConfig<typeof getChannelSeriesQueryOptions>;
}) {
  return useQuery({ ...getChannelSeriesQueryOptions(runId, channelId), enabled: channelId !== '', ...queryConfig });
}

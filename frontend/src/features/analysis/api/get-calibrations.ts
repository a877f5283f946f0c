import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ChannelCalibration } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getCalibrations = (campaignId: string): Promise<ChannelCalibration[]> =>
  api.get<ChannelCalibration[]>(`/campaigns/${campaignId}/calibrations`);

export const getCalibrationsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['calibrations', 'list', campaignId], queryFn: () => getCalibrations(campaignId) });

export function useCalibrations({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getCalibrationsQueryOptions>;
}) {
  return useQuery({ ...getCalibrationsQueryOptions(campaignId), ...queryConfig });
}

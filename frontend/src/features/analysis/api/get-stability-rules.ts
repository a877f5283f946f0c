import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StoredStabilityRule } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getStabilityRules = (campaignId: string): Promise<StoredStabilityRule[]> =>
  api.get<StoredStabilityRule[]>(`/campaigns/${campaignId}/stability-rules`);

export const getStabilityRulesQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['stability-rules', 'list', campaignId], queryFn: () => getStabilityRules(campaignId) });

export function useStabilityRules({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getStabilityRulesQueryOptions>;
}) {
  return useQuery({ ...getStabilityRulesQueryOptions(campaignId), ...queryConfig });
}

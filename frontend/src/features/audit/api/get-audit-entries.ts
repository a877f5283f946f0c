import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditEntry, AuditQuery, Page } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getAuditEntries = (campaignId: string, query: AuditQuery): Promise<Page<AuditEntry>> =>
  api.get<Page<AuditEntry>>(`/campaigns/${campaignId}/audit`, { params: { ...query } });

export const getAuditEntriesQueryOptions = (campaignId: string, query: AuditQuery) =>
  queryOptions({
    queryKey: ['campaigns', campaignId, 'audit', query],
    queryFn: () => getAuditEntries(campaignId, query),
    // Keep the current page on screen while the next one loads.
    placeholderData: keepPreviousData,
  });

export function useAuditEntries({
  campaignId,
  query,
  queryConfig,
}: {
  campaignId: string;
  query: AuditQuery;
  queryConfig?: QueryConfig<typeof getAuditEntriesQueryOptions>;
}) {
  return useQuery({ ...getAuditEntriesQueryOptions(campaignId, query), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Invitation } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getInvitations = (campaignId: string): Promise<Invitation[]> =>
  api.get<Invitation[]>(`/campaigns/${campaignId}/invitations`);

export const getInvitationsQueryOptions = (campaignId: string) =>
  queryOptions({ queryKey: ['campaigns', campaignId, 'invitations'], queryFn: () => getInvitations(campaignId) });

export function useInvitations({
  campaignId,
  queryConfig,
}: {
  campaignId: string;
  queryConfig?: QueryConfig<typeof getInvitationsQueryOptions>;
}) {
  return useQuery({ ...getInvitationsQueryOptions(campaignId), ...queryConfig });
}

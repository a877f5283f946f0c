import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InvitationPreview } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getInvitationPreview = (token: string): Promise<InvitationPreview> =>
  api.get<InvitationPreview>(`/invitations/${encodeURIComponent(token)}`);

export const getInvitationPreviewQueryOptions = (token: string) =>
  queryOptions({ queryKey: ['invitations', token], queryFn: () => getInvitationPreview(token) });

export function useInvitationPreview({
  token,
  queryConfig,
}: {
  token: string;
  queryConfig?: QueryConfig<typeof getInvitationPreviewQueryOptions>;
}) {
  return useQuery({ ...getInvitationPreviewQueryOptions(token), ...queryConfig });
}

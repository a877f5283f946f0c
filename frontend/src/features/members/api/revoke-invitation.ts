import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getInvitationsQueryOptions } from './get-invitations';

export interface RevokeInvitationInput {
  campaignId: string;
  invitationId: string;
}

export const revokeInvitation = ({ campaignId, invitationId }: RevokeInvitationInput): Promise<void> =>
  api.delete(`/campaigns/${campaignId}/invitations/${invitationId}`);

export function useRevokeInvitation({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof revokeInvitation> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: revokeInvitation,
    onSuccess: (...args) => {
      const { campaignId } = args[1];
      void queryClient.invalidateQueries({ queryKey: getInvitationsQueryOptions(campaignId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ['campaigns', campaignId, 'audit'] });
      return onSuccess?.(...args);
    },
  });
}

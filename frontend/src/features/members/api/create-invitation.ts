import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateInvitationRequest, Invitation } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getInvitationsQueryOptions } from './get-invitations';

export interface CreateInvitationInput {
  campaignId: string;
  data: CreateInvitationRequest;
}

export const createInvitation = ({ campaignId, data }: CreateInvitationInput): Promise<Invitation> =>
  api.post<Invitation>(`/campaigns/${campaignId}/invitations`, data);

export function useCreateInvitation({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof createInvitation> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createInvitation,
    onSuccess: (...args) => {
      const { campaignId } = args[1];
      void queryClient.invalidateQueries({ queryKey: getInvitationsQueryOptions(campaignId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ['campaigns', campaignId, 'audit'] });
      return onSuccess?.(...args);
    },
  });
}

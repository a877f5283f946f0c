import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface RemoveMemberInput {
  campaignId: string;
  userId: string;
}

export const removeMember = ({ campaignId, userId }: RemoveMemberInput): Promise<void> =>
  api.delete(`/campaigns/${campaignId}/members/${userId}`);

export function useRemoveMember({ mutationConfig }: { mutationConfig?: MutationConfig<typeof removeMember> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: removeMember,
    onSuccess: (...args) => {
      // Member count on the campaign and the audit trail change too.
      void queryClient.invalidateQueries({ queryKey: ['campaigns', args[1].campaignId] });
      return onSuccess?.(...args);
    },
  });
}

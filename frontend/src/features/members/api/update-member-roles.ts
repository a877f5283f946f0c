import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CampaignMember, UpdateMemberRolesRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface UpdateMemberRolesInput {
  campaignId: string;
  userId: string;
  data: UpdateMemberRolesRequest;
}

export const updateMemberRoles = ({ campaignId, userId, data }: UpdateMemberRolesInput): Promise<CampaignMember> =>
  api.put<CampaignMember>(`/campaigns/${campaignId}/members/${userId}`, data);

export function useUpdateMemberRoles({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof updateMemberRoles> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateMemberRoles,
    onSuccess: (...args) => {
      // The member list, my own roles on the campaign and the audit trail may all change.
      void queryClient.invalidateQueries({ queryKey: ['campaigns'] });
      return onSuccess?.(...args);
    },
  });
}

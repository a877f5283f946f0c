import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Campaign, UpdateCampaignRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface UpdateCampaignInput {
  campaignId: string;
  data: UpdateCampaignRequest;
}

export const updateCampaign = ({ campaignId, data }: UpdateCampaignInput): Promise<Campaign> =>
  api.patch<Campaign>(`/campaigns/${campaignId}`, data);

export function useUpdateCampaign({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateCampaign> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateCampaign,
    onSuccess: (...args) => {
      // Lists, the detail and the audit trail all change.
      void queryClient.invalidateQueries({ queryKey: ['campaigns'] });
      return onSuccess?.(...args);
    },
  });
}

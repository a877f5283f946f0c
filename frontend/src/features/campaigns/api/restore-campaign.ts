import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Campaign } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface RestoreCampaignInput {
  campaignId: string;
  reason?: string;
}

export const restoreCampaign = ({ campaignId, reason }: RestoreCampaignInput): Promise<Campaign> =>
  api.post<Campaign>(`/campaigns/${campaignId}/restore`, reason ? { reason } : {});

export function useRestoreCampaign({ mutationConfig }: { mutationConfig?: MutationConfig<typeof restoreCampaign> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: restoreCampaign,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: ['campaigns'] });
      return onSuccess?.(...args);
    },
  });
}

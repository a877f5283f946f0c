import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Campaign } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface ArchiveCampaignInput {
  campaignId: string;
  reason?: string;
}

export const archiveCampaign = ({ campaignId, reason }: ArchiveCampaignInput): Promise<Campaign> =>
  api.post<Campaign>(`/campaigns/${campaignId}/archive`, reason ? { reason } : {});

export function useArchiveCampaign({ mutationConfig }: { mutationConfig?: MutationConfig<typeof archiveCampaign> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: archiveCampaign,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: ['campaigns'] });
      return onSuccess?.(...args);
    },
  });
}

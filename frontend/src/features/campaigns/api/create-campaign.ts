import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Campaign, CreateCampaignRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getCampaignsQueryOptions } from './get-campaigns';

export const createCampaign = (data: CreateCampaignRequest): Promise<Campaign> =>
  api.post<Campaign>('/campaigns', data);

export function useCreateCampaign({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createCampaign> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createCampaign,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getCampaignsQueryOptions('active').queryKey });
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Channel } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getChannelsQueryOptions } from './get-channels';

export interface ReorderChannelsInput {
  campaignId: string;
  /** Every channel of the campaign once, in the new order. */
  channelIds: string[];
}

export const reorderChannels = ({ campaignId, channelIds }: ReorderChannelsInput): Promise<Channel[]> =>
  api.put<Channel[]>(`/campaigns/${campaignId}/channels/order`, { channelIds });

export function useReorderChannels({ mutationConfig }: { mutationConfig?: MutationConfig<typeof reorderChannels> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: reorderChannels,
    onSuccess: (...args) => {
      const [channels, { campaignId }] = args;
      queryClient.setQueryData(getChannelsQueryOptions(campaignId).queryKey, channels);
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getChannelsQueryOptions } from './get-channels';

export interface DeleteChannelInput {
  channelId: string;
  campaignId: string;
}

export const deleteChannel = ({ channelId }: DeleteChannelInput): Promise<void> => api.delete(`/channels/${channelId}`);

export function useDeleteChannel({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteChannel> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteChannel,
    onSuccess: (...args) => {
      const [, { campaignId }] = args;
      void queryClient.invalidateQueries({ queryKey: getChannelsQueryOptions(campaignId).queryKey });
      // Deleting a channel also deletes its display regions in every run.
      void queryClient.invalidateQueries({ queryKey: ['display-regions'] });
      return onSuccess?.(...args);
    },
  });
}

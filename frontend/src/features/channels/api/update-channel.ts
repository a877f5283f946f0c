import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Channel, UpdateChannelRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getChannelsQueryOptions } from './get-channels';

export interface UpdateChannelInput {
  channelId: string;
  data: UpdateChannelRequest;
}

export const updateChannel = ({ channelId, data }: UpdateChannelInput): Promise<Channel> =>
  api.patch<Channel>(`/channels/${channelId}`, data, { notify: false });

export function useUpdateChannel({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateChannel> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateChannel,
    onSuccess: (...args) => {
      const [channel] = args;
      void queryClient.invalidateQueries({ queryKey: getChannelsQueryOptions(channel.campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

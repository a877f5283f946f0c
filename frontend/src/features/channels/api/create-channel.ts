import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Channel, CreateChannelRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getChannelsQueryOptions } from './get-channels';

export interface CreateChannelInput {
  campaignId: string;
  data: CreateChannelRequest;
}

// The form shows the server's refusal inline, so no notification as well.
export const createChannel = ({ campaignId, data }: CreateChannelInput): Promise<Channel> =>
  api.post<Channel>(`/campaigns/${campaignId}/channels`, data, { notify: false });

export function useCreateChannel({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createChannel> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createChannel,
    onSuccess: (...args) => {
      const [channel] = args;
      void queryClient.invalidateQueries({ queryKey: getChannelsQueryOptions(channel.campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

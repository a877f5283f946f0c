import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getDerivedChannelsQueryOptions } from './get-derived-channels';

export interface DeleteDerivedChannelInput {
  campaignId: string;
  derivedChannelId: string;
}

export const deleteDerivedChannel = ({ derivedChannelId }: DeleteDerivedChannelInput): Promise<void> =>
  api.delete(`/derived-channels/${derivedChannelId}`);

export function useDeleteDerivedChannel({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteDerivedChannel> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteDerivedChannel,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getDerivedChannelsQueryOptions(args[1].campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

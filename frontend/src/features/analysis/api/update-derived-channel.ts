import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DerivedChannel, UpdateDerivedChannelRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getDerivedChannelsQueryOptions } from './get-derived-channels';

export interface UpdateDerivedChannelInput {
  derivedChannelId: string;
  data: UpdateDerivedChannelRequest;
}

export const updateDerivedChannel = ({ derivedChannelId, data }: UpdateDerivedChannelInput): Promise<DerivedChannel> =>
  api.patch<DerivedChannel>(`/derived-channels/${derivedChannelId}`, data, { notify: false });

export function useUpdateDerivedChannel({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateDerivedChannel> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateDerivedChannel,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getDerivedChannelsQueryOptions(args[0].campaignId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ['series'] });
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

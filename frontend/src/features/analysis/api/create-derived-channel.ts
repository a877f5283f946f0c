import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateDerivedChannelRequest, DerivedChannel } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getDerivedChannelsQueryOptions } from './get-derived-channels';

export interface CreateDerivedChannelInput {
  campaignId: string;
  data: CreateDerivedChannelRequest;
}

export const createDerivedChannel = ({ campaignId, data }: CreateDerivedChannelInput): Promise<DerivedChannel> =>
  api.post<DerivedChannel>(`/campaigns/${campaignId}/derived-channels`, data, { notify: false });

export function useCreateDerivedChannel({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createDerivedChannel> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createDerivedChannel,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getDerivedChannelsQueryOptions(args[1].campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

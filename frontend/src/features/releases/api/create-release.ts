import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateReleaseRequest, Release } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { refreshAfterReleaseChange } from './invalidate';

export interface CreateReleaseInput {
  campaignId: string;
  data: CreateReleaseRequest;
}

// The dialog shows the server's refusal itself (e.g. a run with an open mismatch), beside the form.
export const createRelease = ({ campaignId, data }: CreateReleaseInput): Promise<Release> =>
  api.post<Release>(`/campaigns/${campaignId}/releases`, data, { notify: false });

export function useCreateRelease({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createRelease> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createRelease,
    onSuccess: async (...args) => {
      await refreshAfterReleaseChange(queryClient, args[1].campaignId);
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Release, SignReleaseRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { refreshAfterReleaseChange } from './invalidate';

export interface SignReleaseInput {
  releaseId: string;
  campaignId: string;
  data: SignReleaseRequest;
}

export const signRelease = ({ releaseId, data }: SignReleaseInput): Promise<Release> =>
  api.post<Release>(`/releases/${releaseId}/sign`, data, { notify: false });

export function useSignRelease({ mutationConfig }: { mutationConfig?: MutationConfig<typeof signRelease> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: signRelease,
    onSuccess: async (...args) => {
      await refreshAfterReleaseChange(queryClient, args[1].campaignId);
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DeclineReleaseRequest, Release } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface DeclineReleaseInput {
  releaseId: string;
  data: DeclineReleaseRequest;
}

export const declineRelease = ({ releaseId, data }: DeclineReleaseInput): Promise<Release> =>
  api.post<Release>(`/releases/${releaseId}/decline`, data, { notify: false });

export function useDeclineRelease({ mutationConfig }: { mutationConfig?: MutationConfig<typeof declineRelease> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: declineRelease,
    onSuccess: async (...args) => {
      // A declined request locks nothing: only the release lists change.
      await queryClient.invalidateQueries({ queryKey: ['releases'] });
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { OpenCorrectionRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { refreshAfterReleaseChange } from './invalidate';

export interface OpenCorrectionInput {
  runId: string;
  campaignId: string;
  data: OpenCorrectionRequest;
}

export const openCorrection = ({ runId, data }: OpenCorrectionInput): Promise<unknown> =>
  api.post<unknown>(`/runs/${runId}/correction`, data, { notify: false });

export function useOpenCorrection({ mutationConfig }: { mutationConfig?: MutationConfig<typeof openCorrection> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: openCorrection,
    onSuccess: async (...args) => {
      await refreshAfterReleaseChange(queryClient, args[1].campaignId);
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getRunsQueryOptions } from './get-runs';

export interface DeleteRunInput {
  runId: string;
  campaignId: string;
}

export const deleteRun = ({ runId }: DeleteRunInput): Promise<void> => api.delete(`/runs/${runId}`);

export function useDeleteRun({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteRun> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteRun,
    onSuccess: (...args) => {
      const [, { runId, campaignId }] = args;
      queryClient.removeQueries({ queryKey: ['runs', 'detail', runId] });
      void queryClient.invalidateQueries({ queryKey: getRunsQueryOptions(campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

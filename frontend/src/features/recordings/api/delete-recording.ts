import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getRecordingQueryOptions } from './get-recording';

export const deleteRecording = ({ runId }: { runId: string }): Promise<void> => api.delete(`/runs/${runId}/recording`);

export function useDeleteRecording({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteRecording> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteRecording,
    onSuccess: (...args) => {
      const [, { runId }] = args;
      queryClient.setQueryData(getRecordingQueryOptions(runId).queryKey, null);
      // The run and the campaign's run list show the recording too.
      void queryClient.invalidateQueries({ queryKey: ['runs'] });
      return onSuccess?.(...args);
    },
  });
}

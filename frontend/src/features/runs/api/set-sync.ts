import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Run, SetSyncRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getRunQueryOptions } from './get-run';
import { getRunsQueryOptions } from './get-runs';

export interface SetSyncInput {
  runId: string;
  data: SetSyncRequest;
}

// The sync panel shows the server's message beside the marks.
export const setSync = ({ runId, data }: SetSyncInput): Promise<Run> =>
  api.put<Run>(`/runs/${runId}/sync`, data, { notify: false });

export function useSetSync({ mutationConfig }: { mutationConfig?: MutationConfig<typeof setSync> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: setSync,
    onSuccess: (...args) => {
      const [run] = args;
      queryClient.setQueryData(getRunQueryOptions(run.id).queryKey, run);
      void queryClient.invalidateQueries({ queryKey: getRunsQueryOptions(run.campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

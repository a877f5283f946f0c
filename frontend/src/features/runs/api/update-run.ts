import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Run, UpdateRunRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getRunQueryOptions } from './get-run';
import { getRunsQueryOptions } from './get-runs';

export interface UpdateRunInput {
  runId: string;
  data: UpdateRunRequest;
}

export const updateRun = ({ runId, data }: UpdateRunInput): Promise<Run> =>
  api.patch<Run>(`/runs/${runId}`, data, { notify: false });

export function useUpdateRun({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateRun> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateRun,
    onSuccess: (...args) => {
      const [run] = args;
      queryClient.setQueryData(getRunQueryOptions(run.id).queryKey, run);
      void queryClient.invalidateQueries({ queryKey: getRunsQueryOptions(run.campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

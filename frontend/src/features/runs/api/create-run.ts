import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateRunRequest, Run } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getRunsQueryOptions } from './get-runs';

export interface CreateRunInput {
  campaignId: string;
  data: CreateRunRequest;
}

// The form shows the server's refusal inline, so no notification as well.
export const createRun = ({ campaignId, data }: CreateRunInput): Promise<Run> =>
  api.post<Run>(`/campaigns/${campaignId}/runs`, data, { notify: false });

export function useCreateRun({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createRun> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createRun,
    onSuccess: (...args) => {
      const [run] = args;
      queryClient.setQueryData(['runs', 'detail', run.id], run);
      void queryClient.invalidateQueries({ queryKey: getRunsQueryOptions(run.campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

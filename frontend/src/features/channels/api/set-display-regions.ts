import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DisplayRegion, SetDisplayRegionsRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getDisplayRegionsQueryOptions } from './get-display-regions';

export interface SetDisplayRegionsInput {
  runId: string;
  data: SetDisplayRegionsRequest;
}

// The regions card shows the server's message beside the list.
export const setDisplayRegions = ({ runId, data }: SetDisplayRegionsInput): Promise<DisplayRegion[]> =>
  api.put<DisplayRegion[]>(`/runs/${runId}/display-regions`, data, { notify: false });

export function useSetDisplayRegions({ mutationConfig }: { mutationConfig?: MutationConfig<typeof setDisplayRegions> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: setDisplayRegions,
    onSuccess: (...args) => {
      const [regions, { runId }] = args;
      queryClient.setQueryData(getDisplayRegionsQueryOptions(runId).queryKey, regions);
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Analysis } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export const recomputeAnalysis = ({ analysisId }: { analysisId: string }): Promise<Analysis> =>
  api.post<Analysis>(`/analyses/${analysisId}/recompute`);

export function useRecomputeAnalysis({ mutationConfig }: { mutationConfig?: MutationConfig<typeof recomputeAnalysis> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: recomputeAnalysis,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

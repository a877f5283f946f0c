import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export const deleteAnalysis = ({ analysisId }: { analysisId: string }): Promise<void> => api.delete(`/analyses/${analysisId}`);

export function useDeleteAnalysis({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteAnalysis> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteAnalysis,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

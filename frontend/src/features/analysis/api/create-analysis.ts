import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Analysis, CreateAnalysisRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export interface CreateAnalysisInput {
  campaignId: string;
  data: CreateAnalysisRequest;
}

// A refused computation comes back as a 400 with the reason; the save dialog shows it inline.
export const createAnalysis = ({ campaignId, data }: CreateAnalysisInput): Promise<Analysis> =>
  api.post<Analysis>(`/campaigns/${campaignId}/analyses`, data, { notify: false });

export function useCreateAnalysis({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createAnalysis> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createAnalysis,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getStabilityRulesQueryOptions } from './get-stability-rules';

export interface DeleteStabilityRuleInput {
  campaignId: string;
  stabilityRuleId: string;
}

export const deleteStabilityRule = ({ stabilityRuleId }: DeleteStabilityRuleInput): Promise<void> =>
  api.delete(`/stability-rules/${stabilityRuleId}`);

export function useDeleteStabilityRule({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteStabilityRule> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteStabilityRule,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getStabilityRulesQueryOptions(args[1].campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { StoredStabilityRule, UpdateStabilityRuleRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getStabilityRulesQueryOptions } from './get-stability-rules';

export interface UpdateStabilityRuleInput {
  stabilityRuleId: string;
  data: UpdateStabilityRuleRequest;
}

export const updateStabilityRule = ({ stabilityRuleId, data }: UpdateStabilityRuleInput): Promise<StoredStabilityRule> =>
  api.patch<StoredStabilityRule>(`/stability-rules/${stabilityRuleId}`, data, { notify: false });

export function useUpdateStabilityRule({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateStabilityRule> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateStabilityRule,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getStabilityRulesQueryOptions(args[0].campaignId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

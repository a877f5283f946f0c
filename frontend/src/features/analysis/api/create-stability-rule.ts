import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateStabilityRuleRequest, StoredStabilityRule } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getStabilityRulesQueryOptions } from './get-stability-rules';

export interface CreateStabilityRuleInput {
  campaignId: string;
  data: CreateStabilityRuleRequest;
}

export const createStabilityRule = ({ campaignId, data }: CreateStabilityRuleInput): Promise<StoredStabilityRule> =>
  api.post<StoredStabilityRule>(`/campaigns/${campaignId}/stability-rules`, data, { notify: false });

export function useCreateStabilityRule({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createStabilityRule> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createStabilityRule,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getStabilityRulesQueryOptions(args[1].campaignId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

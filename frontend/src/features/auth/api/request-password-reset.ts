import { useMutation } from '@tanstack/react-query';
import type { PasswordResetRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export const requestPasswordReset = (data: PasswordResetRequest): Promise<void> =>
  api.post<void>('/auth/password-reset', data, { notify: false });

export function useRequestPasswordReset({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof requestPasswordReset> } = {}) {
  return useMutation({ ...mutationConfig, mutationFn: requestPasswordReset });
}

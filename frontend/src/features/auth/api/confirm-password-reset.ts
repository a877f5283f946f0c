import { useMutation } from '@tanstack/react-query';
import type { PasswordResetConfirmRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

export const confirmPasswordReset = (data: PasswordResetConfirmRequest): Promise<void> =>
  api.post<void>('/auth/password-reset/confirm', data, { notify: false });

export function useConfirmPasswordReset({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof confirmPasswordReset> } = {}) {
  return useMutation({ ...mutationConfig, mutationFn: confirmPasswordReset });
}

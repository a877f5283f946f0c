import { useMutation } from '@tanstack/react-query';
import type { ChangePasswordRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';

// The form shows "current password is wrong" beside the field instead of a pop-up.
export const changePassword = (data: ChangePasswordRequest): Promise<void> =>
  api.post<void>('/auth/password', data, { notify: false });

export function useChangePassword({ mutationConfig }: { mutationConfig?: MutationConfig<typeof changePassword> } = {}) {
  return useMutation({ ...mutationConfig, mutationFn: changePassword });
}

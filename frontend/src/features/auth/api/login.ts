import { useMutation } from '@tanstack/react-query';
import type { LoginRequest, LoginResponse } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import { useStartSession } from '@/lib/auth';
import type { MutationConfig } from '@/lib/query-client';

// The form shows a wrong password inline, so no pop-up notification here.
export const login = (data: LoginRequest): Promise<LoginResponse> =>
  api.post<LoginResponse>('/auth/login', data, { notify: false });

export function useLogin({ mutationConfig }: { mutationConfig?: MutationConfig<typeof login> } = {}) {
  const startSession = useStartSession();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: login,
    onSuccess: (...args) => {
      startSession(args[0]);
      return onSuccess?.(...args);
    },
  });
}

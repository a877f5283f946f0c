import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateProfileRequest, User } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import { userQueryKey } from '@/lib/auth';
import type { MutationConfig } from '@/lib/query-client';

export const updateProfile = (data: UpdateProfileRequest): Promise<User> => api.patch<User>('/auth/me', data);

export function useUpdateProfile({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateProfile> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateProfile,
    onSuccess: (...args) => {
      queryClient.setQueryData(userQueryKey, args[0]);
      // Member lists and the audit trail show names too.
      void queryClient.invalidateQueries({ queryKey: ['campaigns'] });
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AdminUser, UpdateUserRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getUsersQueryOptions } from './get-users';

export interface UpdateUserInput {
  userId: string;
  data: UpdateUserRequest;
}

export const updateUser = ({ userId, data }: UpdateUserInput): Promise<AdminUser> => api.patch<AdminUser>(`/users/${userId}`, data);

export function useUpdateUser({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateUser> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateUser,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getUsersQueryOptions().queryKey });
      return onSuccess?.(...args);
    },
  });
}

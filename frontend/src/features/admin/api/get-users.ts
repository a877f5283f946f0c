import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AdminUser } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getUsers = (): Promise<AdminUser[]> => api.get<AdminUser[]>('/users');

export const getUsersQueryOptions = () => queryOptions({ queryKey: ['admin', 'users'], queryFn: getUsers });

export function useUsers({ queryConfig }: { queryConfig?: QueryConfig<typeof getUsersQueryOptions> } = {}) {
  return useQuery({ ...getUsersQueryOptions(), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CapturedMail } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getMails = (): Promise<CapturedMail[]> => api.get<CapturedMail[]>('/admin/mail');

export const getMailsQueryOptions = () => queryOptions({ queryKey: ['admin', 'mail'], queryFn: getMails });

export function useMails({ queryConfig }: { queryConfig?: QueryConfig<typeof getMailsQueryOptions> } = {}) {
  return useQuery({ ...getMailsQueryOptions(), ...queryConfig });
}

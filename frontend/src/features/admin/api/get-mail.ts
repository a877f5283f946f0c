import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CapturedMail } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getMail = (mailId: string): Promise<CapturedMail> =>
  api.get<CapturedMail>(`/admin/mail/${encodeURIComponent(mailId)}`);

export const getMailQueryOptions = (mailId: string) =>
  queryOptions({ queryKey: ['admin', 'mail', mailId], queryFn: () => getMail(mailId) });

export function useMail({ mailId, queryConfig }: { mailId: string; queryConfig?: QueryConfig<typeof getMailQueryOptions> }) {
  return useQuery({ ...getMailQueryOptions(mailId), ...queryConfig });
}

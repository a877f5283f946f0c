import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Reading, ReadingPass } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

// The server refuses pass 1 to the checker until pass 2 is finished (403), so callers ask only
// for passes the sheet says they may see; a refusal is not retried.
export const getReadings = (sheetId: string, pass: ReadingPass): Promise<Reading[]> =>
  api.get<Reading[]>(`/sheets/${sheetId}/readings`, { params: { pass }, notify: false });

export const getReadingsQueryOptions = (sheetId: string, pass: ReadingPass) =>
  queryOptions({ queryKey: ['sheets', 'readings', sheetId, pass], queryFn: () => getReadings(sheetId, pass), retry: false });

export function useReadings({
  sheetId,
  pass,
  queryConfig,
}: {
  sheetId: string;
  pass: ReadingPass;
  queryConfig?: QueryConfig<typeof getReadingsQueryOptions>;
}) {
  return useQuery({ ...getReadingsQueryOptions(sheetId, pass), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SheetMismatches } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getMismatches = (sheetId: string): Promise<SheetMismatches> =>
  api.get<SheetMismatches>(`/sheets/${sheetId}/mismatches`, { notify: false });

export const getMismatchesQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: ['sheets', 'mismatches', sheetId], queryFn: () => getMismatches(sheetId), retry: false });

export function useMismatches({ sheetId, queryConfig }: { sheetId: string; queryConfig?: QueryConfig<typeof getMismatchesQueryOptions> }) {
  return useQuery({ ...getMismatchesQueryOptions(sheetId), ...queryConfig });
}

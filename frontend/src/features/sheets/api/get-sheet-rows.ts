import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SheetRow } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getSheetRows = (sheetId: string): Promise<SheetRow[]> => api.get<SheetRow[]>(`/sheets/${sheetId}/rows`);

export const getSheetRowsQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: ['sheets', 'rows', sheetId], queryFn: () => getSheetRows(sheetId) });

export function useSheetRows({ sheetId, queryConfig }: { sheetId: string; queryConfig?: QueryConfig<typeof getSheetRowsQueryOptions> }) {
  return useQuery({ ...getSheetRowsQueryOptions(sheetId), ...queryConfig });
}

import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Sheet } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getSheet = (sheetId: string): Promise<Sheet> => api.get<Sheet>(`/sheets/${sheetId}`);

export const getSheetQueryOptions = (sheetId: string) =>
  queryOptions({ queryKey: ['sheets', 'detail', sheetId], queryFn: () => getSheet(sheetId) });

export function useSheet({ sheetId, queryConfig }: { sheetId: string; queryConfig?: QueryConfig<typeof getSheetQueryOptions> }) {
  return useQuery({ ...getSheetQueryOptions(sheetId), ...queryConfig });
}

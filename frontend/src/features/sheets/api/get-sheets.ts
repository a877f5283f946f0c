import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Sheet } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getSheets = (runId: string): Promise<Sheet[]> => api.get<Sheet[]>(`/runs/${runId}/sheets`);

export const getSheetsQueryOptions = (runId: string) =>
  queryOptions({ queryKey: ['sheets', 'list', runId], queryFn: () => getSheets(runId) });

export function useSheets({ runId, queryConfig }: { runId: string; queryConfig?: QueryConfig<typeof getSheetsQueryOptions> }) {
  return useQuery({ ...getSheetsQueryOptions(runId), ...queryConfig });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Resolution, ResolveCellRequest, SheetGrid } from '@dialsheet/common';
import { api, isApiError } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { withResolution } from '../utils/sheet-grid';
import { getMismatchesQueryOptions } from './get-mismatches';
import { sheetGridKey } from './get-sheet-grid';

export interface ResolveCellInput {
  sheetId: string;
  rowIndex: number;
  channelId: string;
  data: ResolveCellRequest;
}

// The drawer shows refusals inline: a bad value beside the field, a stale base with the stored resolution.
export const resolveCell = ({ sheetId, rowIndex, channelId, data }: ResolveCellInput): Promise<Resolution> =>
  api.put<Resolution>(`/sheets/${sheetId}/resolutions/${rowIndex}/${channelId}`, data, { notify: false });

/** The resolution stored now, when a save was refused because someone else changed it first. */
export function staleResolution(error: unknown): Resolution | null {
  if (!isApiError(error, 409) || !error.body) return null;
  const current = (error.body as { current?: Resolution | null }).current;
  return current && typeof current === 'object' ? current : null;
}

export function useResolveCell({ mutationConfig }: { mutationConfig?: MutationConfig<typeof resolveCell> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: resolveCell,
    onSuccess: (...args) => {
      const [saved, { sheetId }] = args;
      void queryClient.invalidateQueries({ queryKey: getMismatchesQueryOptions(sheetId).queryKey });
      // The table shows the resolved value in the cell at once, without reloading the sheet.
      queryClient.setQueriesData<SheetGrid>({ queryKey: sheetGridKey(sheetId) }, (grid) => (grid ? withResolution(grid, saved) : grid));
      return onSuccess?.(...args);
    },
  });
}

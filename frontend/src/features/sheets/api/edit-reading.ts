import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { Reading, ReadingPass, SaveRowRequest, SaveRowResponse, SheetGrid } from '@dialsheet/common';
import { api, isApiError } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { withReading } from '../utils/sheet-grid';
import { getReadingsQueryOptions } from './get-readings';
import { sheetGridKey } from './get-sheet-grid';

// One cell changed by the owner of its pass in the sheet table. It goes through the same row save
// as entry, with the version it replaces: a cell changed meanwhile (another tab, the entry screen)
// is refused with 409 and the stored reading, never overwritten blind. The server audits the change.

export interface EditReadingInput {
  sheetId: string;
  rowIndex: number;
  pass: ReadingPass;
  channelId: string;
  rawText: string;
  /** The stored entry being replaced (its version and frame); null for a cell that has none yet. */
  existing: { version: number | null; frameTime: number | null } | null;
}

export const editReading = async ({ sheetId, rowIndex, pass, channelId, rawText, existing }: EditReadingInput): Promise<Reading> => {
  const body: SaveRowRequest = {
    pass,
    readings: [
      {
        channelId,
        rawText,
        // The frame the value was read from stays with it; a table edit does not look at the video.
        frameTime: existing?.frameTime ?? null,
        baseVersion: existing?.version ?? null,
      },
    ],
  };
  const response = await api.put<SaveRowResponse>(`/sheets/${sheetId}/rows/${rowIndex}`, body, { notify: false });
  return response.readings[0];
};

/**
 * A refused edit because the cell changed first (409 with the stored reading, which may be null
 * when the entry is gone); null for any other error, including a 409 for a finished pass or a lock.
 */
export function staleConflict(error: unknown): { current: Reading | null } | null {
  if (!isApiError(error, 409) || !error.body || !('current' in error.body)) return null;
  const current = (error.body as { current?: Reading | null }).current;
  return { current: current && typeof current === 'object' ? current : null };
}

function replaceReading(list: Reading[] | undefined, next: Reading): Reading[] | undefined {
  if (!list) return list;
  const at = list.findIndex((r) => r.rowIndex === next.rowIndex && r.channelId === next.channelId);
  if (at < 0) return [...list, next].sort((a, b) => a.rowIndex - b.rowIndex);
  const copy = list.slice();
  copy[at] = next;
  return copy;
}

/** Puts a stored reading into every cached copy of its sheet (the table's grid and the pass's list). */
function putReading(queryClient: QueryClient, sheetId: string, reading: Reading): void {
  queryClient.setQueryData(getReadingsQueryOptions(sheetId, reading.pass).queryKey, (list) => replaceReading(list, reading));
  queryClient.setQueriesData<SheetGrid>({ queryKey: sheetGridKey(sheetId) }, (grid) => (grid ? withReading(grid, reading) : grid));
}

export function useEditReading({ mutationConfig }: { mutationConfig?: MutationConfig<typeof editReading> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: editReading,
    onSuccess: (...args) => {
      const [saved, { sheetId }] = args;
      putReading(queryClient, sheetId, saved);
      // Progress and the comparison move with the entry.
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'detail', sheetId] });
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'mismatches', sheetId] });
      return onSuccess?.(...args);
    },
  });
}

/** Puts the stored reading into the cache after a refused edit, so the table shows what is there now. */
export function useReloadReading() {
  const queryClient = useQueryClient();
  return (sheetId: string, pass: ReadingPass, current: Reading | null) => {
    if (current) putReading(queryClient, sheetId, current);
    else {
      void queryClient.invalidateQueries({ queryKey: getReadingsQueryOptions(sheetId, pass).queryKey });
      void queryClient.invalidateQueries({ queryKey: sheetGridKey(sheetId) });
    }
  };
}

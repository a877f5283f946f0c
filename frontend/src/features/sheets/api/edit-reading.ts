import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Reading, ReadingPass, SaveRowRequest, SaveRowResponse } from '@dialsheet/common';
import { api, isApiError } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getReadingsQueryOptions } from './get-readings';

// One cell changed by the owner of its pass in the sheet table. It goes through the same row save
// as entry, with the version it replaces: a cell changed meanwhile (another tab, the entry screen)
// is refused with 409 and the stored reading, never overwritten blind. The server audits the change.

export interface EditReadingInput {
  sheetId: string;
  rowIndex: number;
  pass: ReadingPass;
  channelId: string;
  rawText: string;
  /** The stored entry being replaced; null for a cell that has none yet. */
  existing: Reading | null;
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

export function useEditReading({ mutationConfig }: { mutationConfig?: MutationConfig<typeof editReading> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: editReading,
    onSuccess: (...args) => {
      const [saved, { sheetId, pass }] = args;
      queryClient.setQueryData(getReadingsQueryOptions(sheetId, pass).queryKey, (list) => replaceReading(list, saved));
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
    if (current) queryClient.setQueryData(getReadingsQueryOptions(sheetId, pass).queryKey, (list) => replaceReading(list, current));
    else void queryClient.invalidateQueries({ queryKey: getReadingsQueryOptions(sheetId, pass).queryKey });
  };
}

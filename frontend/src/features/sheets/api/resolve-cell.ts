import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Resolution, ResolveCellRequest } from '@dialsheet/common';
import { api, isApiError } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getMismatchesQueryOptions } from './get-mismatches';

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
      const [, { sheetId }] = args;
      void queryClient.invalidateQueries({ queryKey: getMismatchesQueryOptions(sheetId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

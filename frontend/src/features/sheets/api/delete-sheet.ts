import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getSheetsQueryOptions } from './get-sheets';

export interface DeleteSheetInput {
  sheetId: string;
  runId: string;
}

// A sheet that holds readings is refused (409); the list shows that message beside the sheet.
export const deleteSheet = ({ sheetId }: DeleteSheetInput): Promise<void> => api.delete(`/sheets/${sheetId}`, { notify: false });

export function useDeleteSheet({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteSheet> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteSheet,
    onSuccess: (...args) => {
      const [, { sheetId, runId }] = args;
      queryClient.removeQueries({ queryKey: ['sheets', 'detail', sheetId] });
      void queryClient.invalidateQueries({ queryKey: getSheetsQueryOptions(runId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

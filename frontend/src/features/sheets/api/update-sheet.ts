import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Sheet, UpdateSheetRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getSheetQueryOptions } from './get-sheet';
import { getSheetsQueryOptions } from './get-sheets';

export interface UpdateSheetInput {
  sheetId: string;
  data: UpdateSheetRequest;
}

export const updateSheet = ({ sheetId, data }: UpdateSheetInput): Promise<Sheet> =>
  api.patch<Sheet>(`/sheets/${sheetId}`, data, { notify: false });

export function useUpdateSheet({ mutationConfig }: { mutationConfig?: MutationConfig<typeof updateSheet> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: updateSheet,
    onSuccess: (...args) => {
      const [sheet] = args;
      queryClient.setQueryData(getSheetQueryOptions(sheet.id).queryKey, sheet);
      void queryClient.invalidateQueries({ queryKey: getSheetsQueryOptions(sheet.runId).queryKey });
      // New times or channels make new rows, and the comparison runs over the new plan.
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'rows', sheet.id] });
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'mismatches', sheet.id] });
      return onSuccess?.(...args);
    },
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AssignSheetRequest, Sheet } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getSheetQueryOptions } from './get-sheet';
import { getSheetsQueryOptions } from './get-sheets';

export interface AssignSheetInput {
  sheetId: string;
  data: AssignSheetRequest;
}

export const assignSheet = ({ sheetId, data }: AssignSheetInput): Promise<Sheet> =>
  api.put<Sheet>(`/sheets/${sheetId}/assignment`, data, { notify: false });

export function useAssignSheet({ mutationConfig }: { mutationConfig?: MutationConfig<typeof assignSheet> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: assignSheet,
    onSuccess: (...args) => {
      const [sheet] = args;
      queryClient.setQueryData(getSheetQueryOptions(sheet.id).queryKey, sheet);
      void queryClient.invalidateQueries({ queryKey: getSheetsQueryOptions(sheet.runId).queryKey });
      // Who may see which pass follows the assignment.
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'readings', sheet.id] });
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'mismatches', sheet.id] });
      return onSuccess?.(...args);
    },
  });
}

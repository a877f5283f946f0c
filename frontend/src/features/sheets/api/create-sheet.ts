import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateSheetRequest, Sheet } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getSheetQueryOptions } from './get-sheet';
import { getSheetsQueryOptions } from './get-sheets';

export interface CreateSheetInput {
  runId: string;
  data: CreateSheetRequest;
}

// The form shows the server's refusal beside the field it names, so no notification as well.
export const createSheet = ({ runId, data }: CreateSheetInput): Promise<Sheet> =>
  api.post<Sheet>(`/runs/${runId}/sheets`, data, { notify: false });

export function useCreateSheet({ mutationConfig }: { mutationConfig?: MutationConfig<typeof createSheet> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: createSheet,
    onSuccess: (...args) => {
      const [sheet] = args;
      queryClient.setQueryData(getSheetQueryOptions(sheet.id).queryKey, sheet);
      void queryClient.invalidateQueries({ queryKey: getSheetsQueryOptions(sheet.runId).queryKey });
      return onSuccess?.(...args);
    },
  });
}

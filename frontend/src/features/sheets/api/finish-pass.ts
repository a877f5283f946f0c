import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PassFinish, ReadingPass } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getSheetQueryOptions } from './get-sheet';

export interface FinishPassInput {
  sheetId: string;
  pass: ReadingPass;
}

// The dialog shows the server's answer itself (409: how many cells still have no entry).
export const finishPass = ({ sheetId, pass }: FinishPassInput): Promise<PassFinish> =>
  api.post<PassFinish>(`/sheets/${sheetId}/passes/${pass}/finish`, undefined, { notify: false });

export function useFinishPass({ mutationConfig }: { mutationConfig?: MutationConfig<typeof finishPass> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: finishPass,
    onSuccess: async (...args) => {
      const [, { sheetId }] = args;
      // The sheet now says the pass is finished (and, after pass 2, pass 1 becomes visible).
      await queryClient.invalidateQueries({ queryKey: getSheetQueryOptions(sheetId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'list'] });
      void queryClient.invalidateQueries({ queryKey: ['sheets', 'mismatches', sheetId] });
      return onSuccess?.(...args);
    },
  });
}

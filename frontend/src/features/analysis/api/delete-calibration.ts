import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getCalibrationsQueryOptions } from './get-calibrations';

export interface DeleteCalibrationInput {
  campaignId: string;
  channelId: string;
  baseVersion: number;
}

export const deleteCalibration = ({ channelId, baseVersion }: DeleteCalibrationInput): Promise<void> =>
  api.delete(`/channels/${channelId}/calibration`, { params: { baseVersion } });

export function useDeleteCalibration({ mutationConfig }: { mutationConfig?: MutationConfig<typeof deleteCalibration> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: deleteCalibration,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getCalibrationsQueryOptions(args[1].campaignId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ['series'] });
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

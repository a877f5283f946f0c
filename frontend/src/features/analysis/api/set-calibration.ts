import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ChannelCalibration, SetCalibrationRequest } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { MutationConfig } from '@/lib/query-client';
import { getCalibrationsQueryOptions } from './get-calibrations';

export interface SetCalibrationInput {
  campaignId: string;
  channelId: string;
  data: SetCalibrationRequest;
}

// The editor shows the server's message (and a 409's reload offer) inline.
export const setCalibration = ({ channelId, data }: SetCalibrationInput): Promise<ChannelCalibration> =>
  api.put<ChannelCalibration>(`/channels/${channelId}/calibration`, data, { notify: false });

export function useSetCalibration({ mutationConfig }: { mutationConfig?: MutationConfig<typeof setCalibration> } = {}) {
  const queryClient = useQueryClient();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: setCalibration,
    onSuccess: (...args) => {
      void queryClient.invalidateQueries({ queryKey: getCalibrationsQueryOptions(args[1].campaignId).queryKey });
      // Series and analyses of the channel change with its calibration.
      void queryClient.invalidateQueries({ queryKey: ['series'] });
      void queryClient.invalidateQueries({ queryKey: ['analyses'] });
      return onSuccess?.(...args);
    },
  });
}

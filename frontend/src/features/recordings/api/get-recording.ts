import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Recording } from '@dialsheet/common';
import { api, isApiError } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';
import { isProcessing } from '@/lib/recording-status';

const POLL_MS = 1000;

/** The run's recording, or null while the run has none (the server answers 404 then). */
export const getRecording = async (runId: string): Promise<Recording | null> => {
  try {
    return await api.get<Recording>(`/runs/${runId}/recording`);
  } catch (error) {
    if (isApiError(error, 404)) return null;
    throw error;
  }
};

export const getRecordingQueryOptions = (runId: string) =>
  queryOptions({
    queryKey: ['recordings', 'by-run', runId],
    queryFn: () => getRecording(runId),
    // Live status while the server probes and transcodes; quiet once ready or failed.
    refetchInterval: (query) => (isProcessing(query.state.data) ? POLL_MS : false),
    // Several parts of the run page read it; they share one answer rather than each asking anew.
    staleTime: POLL_MS,
  });

export function useRecording({
  runId,
  queryConfig,
}: {
  runId: string;
  queryConfig?: QueryConfig<typeof getRecordingQueryOptions>;
}) {
  return useQuery({ ...getRecordingQueryOptions(runId), ...queryConfig });
}

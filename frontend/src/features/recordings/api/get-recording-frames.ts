import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RecordingFrames } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

export const getRecordingFrames = (recordingId: string): Promise<RecordingFrames> =>
  api.get<RecordingFrames>(`/recordings/${recordingId}/frames`);

export const getRecordingFramesQueryOptions = (recordingId: string) =>
  queryOptions({
    queryKey: ['recordings', recordingId, 'frames'],
    queryFn: () => getRecordingFrames(recordingId),
    // A recording's frame times never change once it is ready.
    staleTime: Infinity,
  });

export function useRecordingFrames({
  recordingId,
  queryConfig,
}: {
  recordingId: string;
  queryConfig?: QueryConfig<typeof getRecordingFramesQueryOptions>;
}) {
  return useQuery({ ...getRecordingFramesQueryOptions(recordingId), ...queryConfig });
}

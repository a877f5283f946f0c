import type { Recording, RecordingStatus } from '@dialsheet/common';

/** Statuses in which the server is still working on a recording. */
export const PROCESSING_STATUSES: readonly RecordingStatus[] = ['uploaded', 'probing', 'transcoding'];

export function isProcessing(recording: Pick<Recording, 'status'> | null | undefined): boolean {
  return recording != null && PROCESSING_STATUSES.includes(recording.status);
}

/** Each processing step in words, as the status tag and the progress panel name it. */
export const RECORDING_STATUS_LABELS: Record<RecordingStatus, string> = {
  uploaded: 'Waiting to process',
  probing: 'Reading the video',
  transcoding: 'Making the playback copy',
  ready: 'Ready',
  failed: 'Failed',
};

import { useCallback, useSyncExternalStore } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { ApiError, DuplicateRecordingError, Recording } from '@dialsheet/common';
import { env } from '@/config/env';
import { ApiRequestError, messageFrom } from '@/lib/api-client';
import { authToken } from '@/lib/auth-token';
import { uploadStore, type UploadState } from '../stores/upload-store';
import { getRecordingQueryOptions } from './get-recording';

export interface UploadProgress {
  loaded: number;
  total: number;
}

export interface UploadRecordingInput {
  runId: string;
  file: File;
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
}

function parseBody(text: string): unknown {
  if (!text) return null;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return null;
  }
}

export function isDuplicateRecordingError(body: unknown): body is DuplicateRecordingError {
  const candidate = body as Partial<DuplicateRecordingError> | null;
  return (
    candidate !== null &&
    typeof candidate === 'object' &&
    candidate.statusCode === 409 &&
    typeof candidate.duplicateOf?.runId === 'string' &&
    typeof candidate.duplicateOf?.runName === 'string'
  );
}

/**
 * Sends the video as multipart field `file`. XMLHttpRequest rather than fetch: only XHR reports
 * upload progress in browsers today. Rejects with ApiRequestError carrying the server's body
 * (a 409 duplicate names the run that already holds the file), or an AbortError when cancelled.
 */
export function uploadRecording({ runId, file, onProgress, signal }: UploadRecordingInput): Promise<Recording> {
  return new Promise<Recording>((resolve, reject) => {
    if (signal?.aborted) {
      reject(new DOMException('The upload was cancelled', 'AbortError'));
      return;
    }
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `${env.apiBase}/runs/${runId}/recording`);
    xhr.setRequestHeader('Accept', 'application/json');
    const token = authToken.get();
    if (token) xhr.setRequestHeader('Authorization', `Bearer ${token}`);

    xhr.upload.addEventListener('progress', (event) => {
      // The request carries a little multipart framing around the file, so its total is used.
      onProgress?.({ loaded: event.loaded, total: event.lengthComputable ? event.total : file.size });
    });
    const onAbortSignal = () => xhr.abort();
    signal?.addEventListener('abort', onAbortSignal, { once: true });
    const settle = () => signal?.removeEventListener('abort', onAbortSignal);

    xhr.addEventListener('load', () => {
      settle();
      const body = parseBody(xhr.responseText);
      if (xhr.status >= 200 && xhr.status < 300 && body) {
        resolve(body as Recording);
        return;
      }
      const apiBody = body && typeof body === 'object' ? (body as ApiError) : null;
      const message = messageFrom(apiBody, xhr.status);
      if (xhr.status === 401 && token) authToken.clear('expired');
      reject(new ApiRequestError(xhr.status, message, apiBody));
    });
    xhr.addEventListener('error', () => {
      settle();
      reject(new ApiRequestError(0, 'The upload stopped: the server could not be reached. Check your connection and try again.', null));
    });
    xhr.addEventListener('abort', () => {
      settle();
      reject(new DOMException('The upload was cancelled', 'AbortError'));
    });

    const form = new FormData();
    form.append('file', file, file.name);
    xhr.send(form);
  });
}

/** The upload of one run's video: its live state, and start / cancel / dismiss. */
export function useUploadRecording(runId: string) {
  const queryClient = useQueryClient();
  const state: UploadState | null = useSyncExternalStore(
    uploadStore.subscribe,
    () => uploadStore.get(runId),
    () => uploadStore.get(runId),
  );

  const start = useCallback(
    (file: File) =>
      uploadStore.start(runId, file, uploadRecording).then((recording) => {
        if (recording) {
          queryClient.setQueryData(getRecordingQueryOptions(runId).queryKey, recording);
          // The run and the campaign's run list show the recording's status.
          void queryClient.invalidateQueries({ queryKey: ['runs'] });
        }
        return recording;
      }),
    [queryClient, runId],
  );
  const cancel = useCallback(() => uploadStore.cancel(runId), [runId]);
  const dismiss = useCallback(() => uploadStore.dismiss(runId), [runId]);

  return { state, start, cancel, dismiss };
}

import type { DuplicateRecordingError, Recording } from '@dialsheet/common';
import { isApiError } from '@/lib/api-client';
import { TransferRate, secondsLeft } from '../utils/transfer-rate';

// Uploads live outside React: a video of several GB takes minutes, and the person may look at
// other pages of the app meanwhile. Coming back to the run shows the same upload, still going.

export type UploadPhase = 'uploading' | 'finishing' | 'done' | 'failed' | 'cancelled';

export interface UploadFailure {
  /** HTTP status, or 0 when the server could not be reached. */
  status: number;
  message: string;
  /** Set for a 409: the run whose recording is the same file. */
  duplicateOf: DuplicateRecordingError['duplicateOf'] | null;
}

export interface UploadState {
  runId: string;
  fileName: string;
  phase: UploadPhase;
  loaded: number;
  total: number;
  /** Whole percent, 0–100. */
  percent: number;
  bytesPerSecond: number | null;
  secondsLeft: number | null;
  error: UploadFailure | null;
}

type Uploader = (input: {
  runId: string;
  file: File;
  onProgress: (progress: { loaded: number; total: number }) => void;
  signal: AbortSignal;
}) => Promise<Recording>;

type Listener = () => void;

const states = new Map<string, UploadState>();
const controllers = new Map<string, AbortController>();
const listeners = new Set<Listener>();

const now = (): number => performance.now();

function emit(): void {
  for (const listener of listeners) listener();
  guardPageUnload();
}

function update(runId: string, patch: Partial<UploadState>): void {
  const previous = states.get(runId);
  if (!previous) return;
  states.set(runId, { ...previous, ...patch });
  emit();
}

function isActive(state: UploadState): boolean {
  return state.phase === 'uploading' || state.phase === 'finishing';
}

// Closing or reloading the tab would drop the upload; the browser asks first while one is going.
function onBeforeUnload(event: BeforeUnloadEvent): void {
  event.preventDefault();
  // Older browsers show the prompt only when returnValue is set.
  event.returnValue = '';
}

let guarding = false;
function guardPageUnload(): void {
  const active = [...states.values()].some(isActive);
  if (active && !guarding) window.addEventListener('beforeunload', onBeforeUnload);
  if (!active && guarding) window.removeEventListener('beforeunload', onBeforeUnload);
  guarding = active;
}

function failureFrom(error: unknown): UploadFailure {
  if (isApiError(error)) {
    const body = error.body as Partial<DuplicateRecordingError> | null;
    const duplicateOf =
      error.status === 409 && body?.duplicateOf && typeof body.duplicateOf.runId === 'string' ? body.duplicateOf : null;
    return { status: error.status, message: error.message, duplicateOf };
  }
  return { status: 0, message: error instanceof Error ? error.message : 'The upload failed.', duplicateOf: null };
}

export const uploadStore = {
  subscribe(listener: Listener): () => void {
    listeners.add(listener);
    return () => listeners.delete(listener);
  },

  get(runId: string): UploadState | null {
    return states.get(runId) ?? null;
  },

  /** True while any upload is sending or waiting for the server's answer. */
  hasActive(): boolean {
    return [...states.values()].some(isActive);
  },

  /**
   * Starts sending `file` as the run's recording. Resolves with the stored recording, or null when
   * the upload failed or was cancelled (the state then says why). One upload per run at a time.
   */
  async start(runId: string, file: File, upload: Uploader): Promise<Recording | null> {
    const existing = states.get(runId);
    if (existing && isActive(existing)) return null;
    const controller = new AbortController();
    controllers.set(runId, controller);
    const rate = new TransferRate();
    rate.add(now(), 0);
    states.set(runId, {
      runId,
      fileName: file.name,
      phase: 'uploading',
      loaded: 0,
      total: file.size,
      percent: 0,
      bytesPerSecond: null,
      secondsLeft: null,
      error: null,
    });
    emit();

    try {
      const recording = await upload({
        runId,
        file,
        signal: controller.signal,
        onProgress: ({ loaded, total }) => {
          rate.add(now(), loaded);
          const speed = rate.bytesPerSecond();
          const done = total > 0 && loaded >= total;
          update(runId, {
            loaded,
            total,
            percent: total > 0 ? Math.min(100, Math.floor((loaded / total) * 100)) : 0,
            bytesPerSecond: speed,
            secondsLeft: done ? 0 : secondsLeft(loaded, total, speed),
            // Every byte is out; the server still hashes, checks the type and stores the file.
            phase: done ? 'finishing' : 'uploading',
          });
        },
      });
      const state = states.get(runId);
      update(runId, { phase: 'done', loaded: state?.total ?? file.size, percent: 100, secondsLeft: 0 });
      return recording;
    } catch (error) {
      if (error instanceof DOMException && error.name === 'AbortError') {
        update(runId, { phase: 'cancelled', bytesPerSecond: null, secondsLeft: null });
      } else {
        update(runId, { phase: 'failed', bytesPerSecond: null, secondsLeft: null, error: failureFrom(error) });
      }
      return null;
    } finally {
      if (controllers.get(runId) === controller) controllers.delete(runId);
    }
  },

  cancel(runId: string): void {
    controllers.get(runId)?.abort();
  },

  /** Forgets a finished, failed or cancelled upload (an active one stays). */
  dismiss(runId: string): void {
    const state = states.get(runId);
    if (state && !isActive(state)) {
      states.delete(runId);
      emit();
    }
  },
};

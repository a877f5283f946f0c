import type { Recording } from '@dialsheet/common';
import type { RecordingEntity } from './recording.entity';

export function toRecording(entity: RecordingEntity): Recording {
  return {
    id: entity.id,
    runId: entity.runId,
    originalName: entity.originalName,
    sizeBytes: entity.sizeBytes,
    sha256: entity.sha256,
    mimeType: entity.mimeType,
    status: entity.status,
    progress: Math.round(entity.progress * 10) / 10,
    failureReason: entity.status === 'failed' ? entity.failureReason : null,
    probe: entity.probe,
    proxy:
      entity.proxyKey && entity.proxyWidth !== null && entity.proxyHeight !== null && entity.proxySizeBytes !== null
        ? { width: entity.proxyWidth, height: entity.proxyHeight, sizeBytes: entity.proxySizeBytes }
        : null,
    createdAt: entity.createdAt.toISOString(),
    uploadedBy: entity.uploadedById,
  };
}

/** The fields of a recording the audit trail records. */
export function recordingSnapshot(entity: RecordingEntity, runName: string): Record<string, unknown> {
  return {
    runId: entity.runId,
    runName,
    originalName: entity.originalName,
    sizeBytes: entity.sizeBytes,
    sha256: entity.sha256,
    mimeType: entity.mimeType,
  };
}

/** Every stored file of a recording, for deletion. */
export function recordingKeys(entity: RecordingEntity): string[] {
  return [entity.originalKey, entity.proxyKey, entity.posterKey].filter((k): k is string => Boolean(k));
}

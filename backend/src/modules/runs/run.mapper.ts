import type { Run } from '@dialsheet/common';
import type { RecordingEntity } from '../recordings/recording.entity';
import { toRecording } from '../recordings/recording.mapper';
import type { RunEntity } from './run.entity';

export function toRun(entity: RunEntity, recording: RecordingEntity | null): Run {
  return {
    id: entity.id,
    campaignId: entity.campaignId,
    name: entity.name,
    runDate: entity.runDate,
    configuration: entity.configuration,
    operator: entity.operator,
    notes: entity.notes,
    sync: entity.sync,
    recording: recording ? toRecording(recording) : null,
    createdAt: entity.createdAt.toISOString(),
    updatedAt: entity.updatedAt.toISOString(),
  };
}

/** The fields of a run the audit trail records. */
export function runSnapshot(entity: RunEntity): Record<string, unknown> {
  return {
    name: entity.name,
    runDate: entity.runDate,
    configuration: entity.configuration,
    operator: entity.operator,
    notes: entity.notes,
  };
}

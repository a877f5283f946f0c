import { Tag, Tooltip } from 'antd';
import { LoadingOutlined } from '@ant-design/icons';
import type { Recording } from '@dialsheet/common';
import { RECORDING_STATUS_LABELS, isProcessing } from '@/lib/recording-status';

const COLOURS = { ready: 'green', failed: 'red' } as const;

/** A run's video at a glance: none, being processed (with its percent), ready or failed. */
export function RecordingStatusTag({ recording }: { recording: Recording | null }) {
  if (!recording) return <Tag className="recording-tag">No video</Tag>;
  const label = RECORDING_STATUS_LABELS[recording.status];
  if (isProcessing(recording)) {
    const percent = recording.status === 'transcoding' ? ` ${Math.round(recording.progress)} %` : '';
    return (
      <Tag color="processing" icon={<LoadingOutlined />} className="recording-tag">
        {label}
        {percent}
      </Tag>
    );
  }
  const tag = (
    <Tag color={COLOURS[recording.status as keyof typeof COLOURS]} className="recording-tag">
      {label}
    </Tag>
  );
  return recording.status === 'failed' && recording.failureReason ? <Tooltip title={recording.failureReason}>{tag}</Tooltip> : tag;
}

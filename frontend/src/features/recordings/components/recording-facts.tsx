import { Card, Descriptions, Tag, Tooltip, Typography, type DescriptionsProps } from 'antd';
import type { Recording } from '@dialsheet/common';
import { DateText } from '@/components/ui/date-text';
import { RecordingStatusTag } from '@/components/ui/recording-status-tag';
import { formatBytes, formatFps } from '@/lib/format';

const dash = <Typography.Text type="secondary">–</Typography.Text>;

function formatSeconds(seconds: number): string {
  if (seconds >= 3600) return `${Math.floor(seconds / 3600)} h ${String(Math.floor((seconds % 3600) / 60)).padStart(2, '0')} min`;
  if (seconds >= 60) return `${Math.floor(seconds / 60)} min ${(seconds % 60).toFixed(1).padStart(4, '0')} s`;
  return `${seconds.toFixed(2)} s`;
}

/** What the file is: its fingerprint, and what the probe found in it. */
export function RecordingFacts({ recording }: { recording: Recording }) {
  const probe = recording.probe;
  const items: NonNullable<DescriptionsProps['items']> = [
    { key: 'status', label: 'Status', children: <RecordingStatusTag recording={recording} /> },
    {
      key: 'file',
      label: 'File',
      children: (
        <Typography.Text ellipsis={{ tooltip: recording.originalName }} className="facts-file-name">
          {recording.originalName}
        </Typography.Text>
      ),
    },
    { key: 'size', label: 'Size', children: <span className="numeric">{formatBytes(recording.sizeBytes)}</span> },
    {
      key: 'sha256',
      label: (
        <Tooltip title="SHA-256 of the bytes as uploaded. The same file always gives the same fingerprint.">
          <span>Fingerprint</span>
        </Tooltip>
      ),
      children: (
        <Typography.Text copyable={{ text: recording.sha256, tooltips: ['Copy SHA-256', 'Copied'] }} className="hash-full">
          <code data-testid="recording-sha256">{recording.sha256}</code>
        </Typography.Text>
      ),
    },
    { key: 'type', label: 'Type', children: recording.mimeType },
    { key: 'uploaded', label: 'Uploaded', children: <DateText value={recording.createdAt} /> },
  ];

  if (probe) {
    const rotated = probe.rotation !== 0;
    items.push(
      { key: 'duration', label: 'Duration', children: <span className="numeric">{formatSeconds(probe.durationSec)}</span> },
      {
        key: 'resolution',
        label: 'Resolution',
        children: (
          <span className="numeric">
            {probe.displayWidth} × {probe.displayHeight}
            {rotated ? <Typography.Text type="secondary"> (stored {probe.width} × {probe.height})</Typography.Text> : null}
          </span>
        ),
      },
      { key: 'rotation', label: 'Rotation', children: <span className="numeric">{probe.rotation}°</span> },
      {
        key: 'codec',
        label: 'Codec',
        children: (
          <span>
            {probe.codec}
            {probe.pixelFormat ? <Typography.Text type="secondary"> · {probe.pixelFormat}</Typography.Text> : null}
          </span>
        ),
      },
      {
        key: 'fps',
        label: 'Frame rate',
        children: (
          <span className="numeric">
            {formatFps(probe.nominalFps)} nominal · {formatFps(probe.averageFps)} average{' '}
            {probe.variableFrameRate ? (
              <Tooltip title="Frame intervals are not all equal. Times come from each frame's own timestamp, so readings stay right.">
                <Tag color="gold" className="vfr-tag">
                  variable frame rate
                </Tag>
              </Tooltip>
            ) : null}
          </span>
        ),
      },
      { key: 'frames', label: 'Frames', children: <span className="numeric">{probe.frameCount.toLocaleString('en-GB')}</span> },
      {
        key: 'keyframes',
        label: 'Keyframes',
        children: (
          <span className="numeric">
            {probe.keyframeCount.toLocaleString('en-GB')}, at most {probe.maxKeyframeInterval.toFixed(2)} s apart
          </span>
        ),
      },
      {
        key: 'created',
        label: 'Filmed (camera clock)',
        children: probe.creationTime ? <DateText value={probe.creationTime} /> : dash,
      },
      { key: 'container', label: 'Container', children: probe.container || dash },
    );
  }

  if (recording.proxy) {
    items.push({
      key: 'proxy',
      label: 'Playback copy',
      children: (
        <span className="numeric">
          {recording.proxy.width} × {recording.proxy.height}, {formatBytes(recording.proxy.sizeBytes)}
        </span>
      ),
    });
  }

  return (
    <Card size="small" className="section-card" title="Recording">
      <Descriptions colon={false} size="small" column={1} items={items} className="recording-facts" />
    </Card>
  );
}

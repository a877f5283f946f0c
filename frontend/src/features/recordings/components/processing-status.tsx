import { Alert, Progress, Steps, Typography } from 'antd';
import type { Recording } from '@dialsheet/common';
import { RECORDING_STATUS_LABELS } from '@/lib/recording-status';

const STEP_OF = { uploaded: 0, probing: 1, transcoding: 2, ready: 3, failed: -1 } as const;

/** Live progress of the server's work on a new video, or why it failed. */
export function ProcessingStatus({ recording }: { recording: Recording }) {
  if (recording.status === 'failed') {
    return (
      <Alert
        type="error"
        showIcon
        className="processing-failed"
        title="The video could not be processed"
        description={
          <>
            <div data-testid="failure-reason">{recording.failureReason ?? 'The server gave no reason.'}</div>
            <div className="muted-note">The uploaded file is kept unchanged. Upload another file to replace it.</div>
          </>
        }
      />
    );
  }

  const step = STEP_OF[recording.status];
  const percent = recording.status === 'transcoding' ? Math.round(recording.progress) : recording.status === 'ready' ? 100 : 0;
  return (
    <div className="processing-status" aria-live="polite">
      <Steps
        size="small"
        current={step}
        items={[
          { title: 'Uploaded' },
          { title: 'Reading the video', content: 'facts and frame times' },
          { title: 'Playback copy', content: 'one keyframe a second' },
          { title: 'Ready' },
        ]}
      />
      <div className="processing-now">
        <Typography.Text strong data-testid="processing-step">
          {RECORDING_STATUS_LABELS[recording.status]}
        </Typography.Text>
        <Progress
          percent={percent}
          status={recording.status === 'ready' ? 'success' : 'active'}
          aria-label="Processing progress"
          format={(value) => <span className="numeric">{value} %</span>}
        />
        <Typography.Text type="secondary" className="muted-note">
          {recording.status === 'uploaded'
            ? 'Queued: the video worker starts on it shortly.'
            : recording.status === 'probing'
              ? 'Reading the stream facts and every frame’s time.'
              : 'Making a copy that steps quickly frame by frame. You can leave this page; the work goes on.'}
        </Typography.Text>
      </div>
    </div>
  );
}

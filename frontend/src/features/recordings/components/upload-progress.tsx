import { Link } from 'react-router-dom';
import { Alert, Button, Flex, Progress, Typography } from 'antd';
import { CloseOutlined } from '@ant-design/icons';
import { paths } from '@/config/paths';
import { formatBytes, formatDuration, formatRate } from '@/lib/format';
import type { UploadState } from '../stores/upload-store';

interface UploadProgressProps {
  state: UploadState;
  campaignId: string;
  onCancel: () => void;
  onDismiss: () => void;
}

/** Percent, speed and time left while a video goes up; then the outcome in plain words. */
export function UploadProgress({ state, campaignId, onCancel, onDismiss }: UploadProgressProps) {
  const active = state.phase === 'uploading' || state.phase === 'finishing';
  const dismiss = (
    <Button type="text" size="small" icon={<CloseOutlined />} aria-label="Dismiss" onClick={onDismiss} />
  );

  if (state.phase === 'failed' && state.error) {
    const { error } = state;
    return (
      <Alert
        type="error"
        showIcon
        className="upload-outcome"
        title={error.message}
        description={
          <>
            {error.duplicateOf ? (
              <Link to={paths.run.getHref(campaignId, error.duplicateOf.runId)} className="duplicate-link">
                Open run {error.duplicateOf.runName}
              </Link>
            ) : null}
            <div className="muted-note">{state.fileName}: nothing was stored.</div>
          </>
        }
        action={dismiss}
      />
    );
  }

  if (state.phase === 'cancelled') {
    return (
      <Alert
        type="info"
        showIcon
        className="upload-outcome"
        title="Upload cancelled"
        description={`${state.fileName}: nothing was stored.`}
        action={dismiss}
      />
    );
  }

  const facts: string[] = [`${formatBytes(state.loaded)} of ${formatBytes(state.total)}`];
  if (state.phase === 'uploading') {
    if (state.bytesPerSecond !== null) facts.push(formatRate(state.bytesPerSecond));
    facts.push(state.secondsLeft !== null ? `${formatDuration(state.secondsLeft)} left` : 'estimating time left');
  }

  return (
    <div className="upload-progress" data-upload-percent={state.percent} data-upload-phase={state.phase}>
      <Flex justify="space-between" align="center" gap={12}>
        <Typography.Text strong ellipsis className="upload-file-name">
          {state.fileName}
        </Typography.Text>
        {active ? (
          <Button size="small" onClick={onCancel} disabled={state.phase === 'finishing'}>
            Cancel upload
          </Button>
        ) : (
          dismiss
        )}
      </Flex>
      <Progress
        percent={state.percent}
        status={state.phase === 'done' ? 'success' : 'active'}
        aria-label="Upload progress"
        format={(percent) => <span className="numeric upload-percent-text">{percent} %</span>}
      />
      <Typography.Text type="secondary" className="upload-facts numeric">
        {state.phase === 'finishing'
          ? 'All sent. The server is checking and storing the file…'
          : state.phase === 'done'
            ? `Uploaded ${formatBytes(state.total)}. The server now processes it.`
            : facts.join(' · ')}
      </Typography.Text>
    </div>
  );
}

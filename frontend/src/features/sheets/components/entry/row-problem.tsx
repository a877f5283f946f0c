import { Alert, Button, Space, Typography } from 'antd';
import type { Channel } from '@dialsheet/common';
import type { QueueRowView } from '../../stores/save-queue';

interface RowProblemProps {
  queued: QueueRowView | undefined;
  channels: readonly Channel[];
  onResend: () => void;
  onKeepMine: () => void;
  onTakeStored: () => void;
}

/**
 * What went wrong with the current row's save, with the way out: a refused row can be fixed and
 * confirmed again (or sent again as it is); a row changed elsewhere shows the stored value and lets
 * the person keep theirs over it or take the stored one.
 */
export function RowProblem({ queued, channels, onResend, onKeepMine, onTakeStored }: RowProblemProps) {
  if (!queued) return null;
  if (queued.status === 'failed') {
    return (
      <Alert
        type="error"
        showIcon
        className="entry-row-problem"
        title="The server did not accept this row"
        description={
          <Space orientation="vertical" size={6}>
            <span>{queued.error}</span>
            <Typography.Text type="secondary">Correct the value and press Enter on the last channel, or send the row again as it is.</Typography.Text>
            <Button size="small" onClick={onResend}>
              Send again
            </Button>
          </Space>
        }
      />
    );
  }
  if (queued.status === 'conflict' && queued.conflict) {
    const { channelId, current } = queued.conflict;
    const channel = channels.find((c) => c.id === channelId);
    const mine = queued.readings.find((r) => r.channelId === channelId)?.rawText ?? '';
    const label = channel ? `${channel.symbol} (${channel.name})` : 'A value';
    return (
      <Alert
        type="warning"
        showIcon
        className="entry-row-problem"
        title={`${label} was changed elsewhere since you loaded it`}
        description={
          <Space orientation="vertical" size={6}>
            <span>
              {current ? (
                <>
                  Stored now: <strong className="numeric">“{current.rawText}”</strong> (version {current.version}). Yours:{' '}
                  <strong className="numeric">“{mine}”</strong>.
                </>
              ) : (
                <>Nothing is stored for it now. Yours: <strong className="numeric">“{mine}”</strong>.</>
              )}
            </span>
            <Space size={8}>
              <Button size="small" type="primary" onClick={onKeepMine}>
                Keep mine
              </Button>
              {current ? (
                <Button size="small" onClick={onTakeStored}>
                  Reload stored value
                </Button>
              ) : null}
            </Space>
          </Space>
        }
      />
    );
  }
  return null;
}

import { memo, useEffect, useState } from 'react';
import { Button, Typography } from 'antd';
import { CheckCircleOutlined, CloudSyncOutlined, ExclamationCircleOutlined, WarningOutlined } from '@ant-design/icons';
import type { QueueSnapshot } from '../../stores/save-queue';

interface QueueStatusProps {
  snapshot: QueueSnapshot;
  onRetryNow: () => void;
}

const rowsWord = (n: number) => `${n} row${n === 1 ? '' : 's'}`;

/** Seconds left until `at`, ticking once a second while a retry is due. */
function useSecondsUntil(at: number | null): number | null {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (at === null) return undefined;
    setNow(Date.now());
    const timer = setInterval(() => setNow(Date.now()), 1000);
    return () => clearInterval(timer);
  }, [at]);
  return at === null ? null : Math.max(0, Math.ceil((at - now) / 1000));
}

/**
 * The connection and save-queue line: everything saved, rows on their way, or rows waiting for the
 * server with the time of the next try. Rows waiting are kept in this browser meanwhile.
 */
export const QueueStatus = memo(function QueueStatus({ snapshot, onRetryNow }: QueueStatusProps) {
  const seconds = useSecondsUntil(snapshot.retryAt);
  let tone: 'ok' | 'busy' | 'waiting' | 'problem' = 'ok';
  let text = 'All rows saved';
  if (snapshot.retryAt !== null) {
    tone = 'waiting';
    text = `${rowsWord(snapshot.waiting)} waiting — retrying in ${seconds ?? 0} s`;
  } else if (snapshot.waiting > 0) {
    tone = 'busy';
    text = `Saving ${rowsWord(snapshot.waiting)}…`;
  }
  const problems: string[] = [];
  if (snapshot.failed > 0) problems.push(`${rowsWord(snapshot.failed)} not saved`);
  if (snapshot.conflicts > 0) problems.push(`${rowsWord(snapshot.conflicts)} changed elsewhere`);
  if (problems.length > 0 && tone !== 'waiting') tone = 'problem';
  const icon =
    tone === 'ok' ? <CheckCircleOutlined /> : tone === 'busy' ? <CloudSyncOutlined /> : tone === 'waiting' ? <WarningOutlined /> : <ExclamationCircleOutlined />;

  return (
    <div className={`entry-queue-status tone-${tone}`} role="status" data-testid="entry-queue-status">
      <span className="entry-queue-icon">{icon}</span>
      <span className="entry-queue-text numeric">
        {text}
        {problems.length > 0 ? ` · ${problems.join(' · ')}` : ''}
      </span>
      {snapshot.retryAt !== null ? (
        <>
          {snapshot.lastError ? (
            <Typography.Text type="secondary" className="entry-queue-reason">
              {snapshot.lastError.replace(/[.\s]*$/, '.')} Typed rows are kept in this browser.
            </Typography.Text>
          ) : null}
          <Button size="small" onClick={onRetryNow}>
            Retry now
          </Button>
        </>
      ) : null}
      {snapshot.storageProblem ? (
        <Typography.Text type="warning" className="entry-queue-reason">
          {snapshot.storageProblem}
        </Typography.Text>
      ) : null}
    </div>
  );
});

import { useState } from 'react';
import { Alert, Button, Card, Descriptions, Flex, Input, Popconfirm, Table, Tooltip, Typography } from 'antd';
import { AimOutlined, FlagOutlined } from '@ant-design/icons';
import {
  describeSync,
  formatTestTime,
  parseTimecode,
  validateSyncMarks,
  type Run,
  type SetSyncRequest,
  type SyncDescription,
  type SyncMark,
} from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useSetSync } from '../api/set-sync';

export interface SyncFrame {
  index: number;
  /** Presentation time of the frame's start (s). */
  pts: number;
}

interface SyncPanelProps {
  run: Run;
  canEdit: boolean;
  /** The frame the player shows now; null while no video can be played. */
  currentFrame: SyncFrame | null;
  /** Shows the frame at a video time in the player (to look at a mark again). */
  onShowTime?: (videoTime: number) => void;
}

interface MarkRow {
  key: 'first' | 'second';
  label: string;
  mark: SyncMark;
}

function describe(run: Run): SyncDescription | null {
  if (!run.sync) return null;
  try {
    return describeSync(run.sync);
  } catch {
    return null;
  }
}

function driftText(description: SyncDescription): string {
  if (description.marks === 1) return 'Not corrected (one mark)';
  const ppm = Math.round(description.driftPpm);
  const sign = ppm > 0 ? '+' : '';
  const clock = ppm > 0 ? ', video clock fast' : ppm < 0 ? ', video clock slow' : '';
  return `${sign}${ppm} ppm${clock}`;
}

/** Reads a typed test time; the error names the field, as the server's would. */
function readTestTime(text: string, field: string): number {
  try {
    return parseTimecode(text);
  } catch (error) {
    throw new RangeError(`${field}: ${errorMessage(error)}`);
  }
}

/**
 * Ties video time to test time. The start mark is the frame of the start marker (a clap, a lamp,
 * a clock in view); an optional later mark, on a frame that shows the test clock, corrects a
 * camera clock that runs fast or slow.
 */
export function SyncPanel({ run, canEdit, currentFrame, onShowTime }: SyncPanelProps) {
  const [startText, setStartText] = useState('0');
  const [secondText, setSecondText] = useState('');
  const [reason, setReason] = useState('');
  const [localError, setLocalError] = useState<string | null>(null);
  const setSync = useSetSync({
    mutationConfig: {
      onSuccess: () => {
        setSecondText('');
        setReason('');
      },
    },
  });
  const description = describe(run);
  const marks: MarkRow[] = run.sync
    ? [
        { key: 'first', label: 'Start', mark: run.sync.first },
        ...(run.sync.second ? [{ key: 'second' as const, label: 'Second', mark: run.sync.second }] : []),
      ]
    : [];

  const save = (build: () => SetSyncRequest) => {
    setLocalError(null);
    setSync.reset();
    let request: SetSyncRequest;
    try {
      request = build();
      validateSyncMarks({ first: request.first, second: request.second ?? undefined });
    } catch (error) {
      setLocalError(errorMessage(error));
      return;
    }
    const why = reason.trim();
    setSync.mutate({ runId: run.id, data: why ? { ...request, reason: why } : request });
  };

  const markStart = () =>
    save(() => {
      if (!currentFrame) throw new RangeError('Load the video first, then step to the start marker.');
      return {
        first: { videoTime: currentFrame.pts, testTime: readTestTime(startText, 'Test time at the start mark') },
        second: run.sync?.second ?? null,
      };
    });

  const markSecond = () =>
    save(() => {
      if (!currentFrame) throw new RangeError('Load the video first, then step to a frame that shows the test clock.');
      if (!run.sync) throw new RangeError('Mark the start first.');
      if (secondText.trim() === '') throw new RangeError('Type the test time the clock shows at this frame.');
      return {
        first: run.sync.first,
        second: { videoTime: currentFrame.pts, testTime: readTestTime(secondText, 'Test time at the second mark') },
      };
    });

  const removeSecond = () =>
    save(() => {
      if (!run.sync) throw new RangeError('There is no sync to change.');
      return { first: run.sync.first, second: null };
    });

  const error = localError ?? (setSync.isError ? errorMessage(setSync.error) : null);

  return (
    <Card size="small" className="section-card" title="Time sync">
      {description ? (
        <Descriptions
          colon={false}
          size="small"
          column={1}
          className="sync-summary"
          items={[
            {
              key: 'offset',
              label: 'Offset',
              children: (
                <Tooltip title="Test time = video time − offset (before drift correction)">
                  <span className="numeric" data-testid="sync-offset">
                    {description.offset.toFixed(3)} s
                  </span>
                </Tooltip>
              ),
            },
            { key: 'drift', label: 'Clock drift', children: <span className="numeric">{driftText(description)}</span> },
          ]}
        />
      ) : (
        <Typography.Paragraph type="secondary" className="sync-empty">
          Not set yet. {canEdit ? 'Step to the frame where the start marker shows (a clap, a lamp, a clock) and mark it.' : ''}
        </Typography.Paragraph>
      )}

      {marks.length > 0 ? (
        <Table<MarkRow>
          size="small"
          className="data-table sync-marks"
          pagination={false}
          rowKey="key"
          dataSource={marks}
          columns={[
            { title: 'Mark', dataIndex: 'label', width: 70 },
            {
              title: 'Video time',
              key: 'video',
              render: (_, row) => (
                <Tooltip title={`${row.mark.videoTime.toFixed(6)} s`}>
                  <span className="numeric">{formatTestTime(row.mark.videoTime)}</span>
                </Tooltip>
              ),
            },
            { title: 'Test time', key: 'test', render: (_, row) => <span className="numeric">{formatTestTime(row.mark.testTime)}</span> },
            {
              key: 'show',
              width: 44,
              render: (_, row) =>
                onShowTime ? (
                  <Tooltip title="Show this frame">
                    <Button
                      size="small"
                      type="text"
                      icon={<AimOutlined />}
                      aria-label={`Show the ${row.label.toLowerCase()} mark frame`}
                      onClick={() => onShowTime(row.mark.videoTime)}
                    />
                  </Tooltip>
                ) : null,
            },
          ]}
        />
      ) : null}

      {canEdit && currentFrame ? (
        <div className="sync-editor">
          <Typography.Paragraph type="secondary" className="sync-current">
            At frame <span className="numeric">{currentFrame.index}</span>, video time{' '}
            <span className="numeric">{formatTestTime(currentFrame.pts)}</span>
          </Typography.Paragraph>
          <div className="sync-field">
            <span>Test time at the start mark</span>
            <Flex gap={8}>
              <Input
                value={startText}
                onChange={(event) => setStartText(event.target.value)}
                aria-label="Test time at the start mark"
                className="sync-input numeric"
                disabled={setSync.isPending}
              />
              <Button
                type="primary"
                icon={<FlagOutlined />}
                onClick={markStart}
                loading={setSync.isPending}
              >
                Mark start here
              </Button>
            </Flex>
          </div>
          <div className="sync-field">
            <span>Test time the clock shows here (optional second mark)</span>
            <Flex gap={8}>
              <Input
                value={secondText}
                onChange={(event) => setSecondText(event.target.value)}
                placeholder="e.g. 05:00.000"
                aria-label="Test time at the second mark"
                className="sync-input numeric"
                disabled={!run.sync || setSync.isPending}
              />
              <Button onClick={markSecond} disabled={!run.sync} loading={setSync.isPending}>
                Mark second here
              </Button>
            </Flex>
          </div>
          {run.sync ? (
            <Input
              value={reason}
              onChange={(event) => setReason(event.target.value)}
              placeholder="Reason for the change (optional, kept in the audit trail)"
              aria-label="Reason for the change"
              maxLength={500}
              className="sync-reason"
            />
          ) : null}
          {run.sync?.second ? (
            <Popconfirm title="Remove the second mark?" description="Test time then follows the start mark only." onConfirm={removeSecond}>
              <Button type="link" size="small" className="sync-remove">
                Remove the second mark
              </Button>
            </Popconfirm>
          ) : null}
          <Typography.Paragraph type="secondary" className="sync-help">
            Type times as seconds (12.5), mm:ss.sss or h:mm:ss.sss.
          </Typography.Paragraph>
        </div>
      ) : canEdit ? (
        <Typography.Paragraph type="secondary" className="card-footnote">
          Marks are set on the video once it is ready to play.
        </Typography.Paragraph>
      ) : (
        <Typography.Paragraph type="secondary" className="card-footnote">
          Only a lead or engineer of this campaign sets the sync.
        </Typography.Paragraph>
      )}
      {error ? <Alert type="error" showIcon title={error} className="sync-error" role="alert" /> : null}
    </Card>
  );
}

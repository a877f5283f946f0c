import { Progress, Tooltip, Typography } from 'antd';
import { CheckCircleFilled } from '@ant-design/icons';
import type { PassProgress as PassProgressData, ReadingPass } from '@dialsheet/common';
import { formatDateTime } from '@/components/ui/date-text';
import { formatCount } from '../utils/sheet-format';

interface PassProgressProps {
  pass: ReadingPass;
  progress: PassProgressData;
  finishedAt: string | null;
  /** Wider bar with the label above it (the sheet page); the list uses the compact form. */
  wide?: boolean;
}

/** One pass: cells entered of all cells, and whether its owner has marked it finished. */
export function PassProgress({ pass, progress, finishedAt, wide = false }: PassProgressProps) {
  const { done, total } = progress;
  const percent = total > 0 ? Math.floor((done / total) * 1000) / 10 : 0;
  const label = `Pass ${pass}: ${formatCount(done)} of ${formatCount(total)} cells entered${finishedAt ? ', finished' : ''}`;
  return (
    <div className={`pass-progress${wide ? ' is-wide' : ''}`} aria-label={label} role="group" data-testid={`pass-${pass}-progress`}>
      <div className="pass-progress-head">
        <Typography.Text strong={wide}>Pass {pass}</Typography.Text>
        <span className="numeric pass-progress-count">
          {formatCount(done)} / {formatCount(total)}
        </span>
        {finishedAt ? (
          <Tooltip title={`Finished ${formatDateTime(finishedAt)}`}>
            <span className="pass-finished">
              <CheckCircleFilled aria-hidden /> finished{wide ? ` ${formatDateTime(finishedAt)}` : ''}
            </span>
          </Tooltip>
        ) : null}
      </div>
      <Progress
        percent={percent}
        size="small"
        showInfo={false}
        status={finishedAt ? 'success' : 'normal'}
        aria-label={`Pass ${pass} progress`}
      />
    </div>
  );
}

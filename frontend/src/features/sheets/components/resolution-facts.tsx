import { Typography } from 'antd';
import type { Resolution } from '@dialsheet/common';
import { formatDateTime } from '@/components/ui/date-text';
import { ReadingText } from './reading-text';

/** A stored resolution: the value, why, who and when. */
export function ResolutionFacts({ resolution, unit, byName }: { resolution: Resolution; unit: string; byName: string | null }) {
  return (
    <div className="resolution-facts" data-testid="resolution-facts">
      <div>
        <Typography.Text type="secondary">Resolved to </Typography.Text>
        <ReadingText text={resolution.rawText} unit={unit} />
      </div>
      <div className="resolution-reason">“{resolution.reason}”</div>
      <Typography.Text type="secondary" className="resolution-meta">
        {byName ?? 'someone'}, {formatDateTime(resolution.resolvedAt)}, version {resolution.version}
      </Typography.Text>
    </div>
  );
}

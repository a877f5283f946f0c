import { Tag, Tooltip } from 'antd';
import type { Analysis } from '@dialsheet/common';

/** current / stale (with why) / failed (with the reason the computation was refused). */
export function AnalysisStatusTag({ analysis }: { analysis: Analysis }) {
  if (analysis.status === 'current') return <Tag color="green">current</Tag>;
  if (analysis.status === 'stale') {
    return (
      <span>
        <Tag color="orange">stale</Tag>
        {analysis.staleReason ? <span className="status-reason">{analysis.staleReason}</span> : null}
      </span>
    );
  }
  return (
    <Tooltip title={analysis.error ?? undefined}>
      <span>
        <Tag color="red">failed</Tag>
        {analysis.error ? <span className="status-reason">{analysis.error}</span> : null}
      </span>
    </Tooltip>
  );
}

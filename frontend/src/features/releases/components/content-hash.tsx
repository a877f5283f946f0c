import { Typography } from 'antd';
import { shortHash } from '../utils/report-format';

/** The first digits of the SHA-256 on screen; the copy button copies all 64. */
export function ContentHash({ hash, full = false }: { hash: string | null; full?: boolean }) {
  if (!hash) return <Typography.Text type="secondary">–</Typography.Text>;
  return (
    <Typography.Text
      code
      className="content-hash numeric"
      title={`SHA-256 ${hash}`}
      copyable={{ text: hash, tooltips: ['Copy the full SHA-256', 'Copied'] }}
    >
      {full ? hash : shortHash(hash)}
    </Typography.Text>
  );
}

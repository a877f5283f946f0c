import { Button, Typography } from 'antd';
import { WarningOutlined } from '@ant-design/icons';
import type { Reading } from '@dialsheet/common';
import { formatDateTime } from '@/components/ui/date-text';
import { formatTime } from '../utils/sheet-format';
import { ReadingText } from './reading-text';

interface PassEntryProps {
  reading: Reading;
  unit: string;
  enteredByName: string | null;
  /** Shows this pass's frame in the player. */
  onShowFrame?: () => void;
  /** Copies this entry into the resolved value. */
  onUse?: () => void;
  /** The key that does onUse, shown on the button. */
  useKey?: string;
}

/** One pass's entry of a cell: the text as typed, who typed it, and the frame it was read from. */
export function PassEntry({ reading, unit, enteredByName, onShowFrame, onUse, useKey }: PassEntryProps) {
  return (
    <section className="pass-entry" aria-label={`Pass ${reading.pass} entry`}>
      <Typography.Text type="secondary" className="pass-entry-label">
        Pass {reading.pass}
        {enteredByName ? ` · ${enteredByName}` : ''}
      </Typography.Text>
      <div className="pass-entry-value">
        <ReadingText text={reading.rawText} unit={unit} />
      </div>
      <div className="pass-entry-frame numeric">
        {reading.frameTime !== null ? (
          <>
            read at frame {formatTime(reading.frameTime)}
            {onShowFrame ? (
              <Button size="small" type="link" onClick={onShowFrame}>
                Show
              </Button>
            ) : null}
          </>
        ) : (
          <Typography.Text type="secondary">frame not recorded</Typography.Text>
        )}
      </div>
      {reading.warnings.map((warning) => (
        <Typography.Text key={warning.code} type="warning" className="pass-entry-warning">
          <WarningOutlined aria-hidden /> {warning.message}
        </Typography.Text>
      ))}
      <Typography.Text type="secondary" className="pass-entry-meta">
        {formatDateTime(reading.updatedAt)}, version {reading.version}
      </Typography.Text>
      {onUse ? (
        <Button size="small" onClick={onUse}>
          Use this value{useKey ? ` (${useKey})` : ''}
        </Button>
      ) : null}
    </section>
  );
}

import dayjs from 'dayjs';
import { Tooltip } from 'antd';

/** Dates read the same everywhere: ISO-like, local time, full precision on hover. */
export function formatDateTime(value: string): string {
  return dayjs(value).format('YYYY-MM-DD HH:mm');
}

export function DateText({ value }: { value: string }) {
  return (
    <Tooltip title={dayjs(value).format('YYYY-MM-DD HH:mm:ss Z')}>
      <time dateTime={value} className="numeric">
        {formatDateTime(value)}
      </time>
    </Tooltip>
  );
}

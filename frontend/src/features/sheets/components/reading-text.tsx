import { Typography } from 'antd';

/** A typed entry exactly as typed; a blank entry reads "blank" so it is not mistaken for nothing. */
export function ReadingText({ text, unit }: { text: string | null | undefined; unit?: string }) {
  if (text === null || text === undefined) return <Typography.Text type="secondary">no entry</Typography.Text>;
  if (text.trim() === '') return <Typography.Text type="secondary" italic>blank</Typography.Text>;
  const flagged = text.trim().startsWith('#');
  return (
    <span className={`numeric reading-text${flagged ? ' is-flag' : ''}`}>
      {text}
      {unit && !flagged ? <span className="channel-unit"> {unit}</span> : null}
    </span>
  );
}

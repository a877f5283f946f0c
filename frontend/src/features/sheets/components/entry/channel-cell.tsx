import { memo, useCallback, type KeyboardEvent, type Ref } from 'react';
import { Input, Tag, Typography, type InputRef } from 'antd';
import type { Channel, DisplayRegion } from '@dialsheet/common';
import type { CellCheck } from './entry-rows';

const WARNING_LABELS: Record<string, string> = {
  'below-plausible': 'below plausible',
  'above-plausible': 'above plausible',
  'outside-operating': 'outside operating limits',
};

interface ChannelCellProps {
  channel: Channel;
  index: number;
  text: string;
  check: CellCheck;
  region: DisplayRegion | undefined;
  /** The stored entry differs from what the input holds (typed, not yet saved). */
  changed: boolean;
  inputRef: Ref<InputRef>;
  canvasRef: (index: number, canvas: HTMLCanvasElement | null) => void;
  onTextChange: (index: number, text: string) => void;
  onKeyDown: (index: number, event: KeyboardEvent<HTMLInputElement>) => void;
}

/**
 * One channel of the row: a zoomed crop of its display, its symbol, name and unit, and the input.
 * A text that is not a reading shows the parser's message under the input (and blocks the save);
 * a value outside the channel's limits shows a tag and is kept.
 */
export const ChannelCell = memo(function ChannelCell({
  channel,
  index,
  text,
  check,
  region,
  changed,
  inputRef,
  canvasRef,
  onTextChange,
  onKeyDown,
}: ChannelCellProps) {
  // A stable ref: an inline one is called again on every render, and each call redraws the crop
  // from the video (milliseconds per call without a GPU) on every key typed and every step.
  const attachCanvas = useCallback((canvas: HTMLCanvasElement | null) => canvasRef(index, canvas), [canvasRef, index]);
  const inputId = `entry-cell-${channel.id}`;
  const messageId = `${inputId}-message`;
  const flag = check.parsed.kind === 'flag' ? check.parsed.flag : null;
  return (
    <div className={`entry-cell${check.error ? ' has-error' : ''}`} data-testid={`entry-cell-${channel.symbol}`}>
      <div className="entry-crop" aria-hidden="true">
        {region ? (
          <canvas ref={attachCanvas} className="entry-crop-canvas" data-testid={`crop-${channel.symbol}`} />
        ) : (
          <span className="entry-crop-missing">no region</span>
        )}
      </div>
      <div className="entry-cell-body">
        <label htmlFor={inputId} className="entry-cell-label">
          <span className="entry-cell-symbol">{channel.symbol}</span>
          <span className="entry-cell-name">{channel.name}</span>
        </label>
        <Input
          id={inputId}
          ref={inputRef}
          value={text}
          size="large"
          autoComplete="off"
          spellCheck={false}
          inputMode="decimal"
          className="entry-input numeric"
          status={check.error ? 'error' : check.warnings.length > 0 ? 'warning' : undefined}
          aria-invalid={check.error ? true : undefined}
          aria-describedby={check.error || check.warnings.length > 0 ? messageId : undefined}
          aria-label={`${channel.symbol} ${channel.name} (${channel.rawUnit})`}
          suffix={<span className="entry-unit">{channel.rawUnit}</span>}
          data-channel-index={index}
          onChange={(event) => onTextChange(index, event.target.value)}
          onKeyDown={(event) => onKeyDown(index, event)}
        />
        <div id={messageId} className="entry-cell-message">
          {check.error ? (
            <Typography.Text type="danger" className="entry-error">
              {check.error}
            </Typography.Text>
          ) : null}
          {check.warnings.map((warning) => (
            <span key={warning.code} className="entry-warning">
              <Tag color="warning">{WARNING_LABELS[warning.code] ?? warning.code}</Tag>
              <Typography.Text type="secondary">{warning.message}</Typography.Text>
            </span>
          ))}
          {flag && text.trim() !== '' ? <Tag className="entry-flag-tag">{flag}</Tag> : null}
          {flag === 'blank' && changed ? <Typography.Text type="secondary">empty: saved as blank</Typography.Text> : null}
        </div>
      </div>
    </div>
  );
});

import { useEffect, useMemo, useRef, useState } from 'react';
import { Drawer, Segmented, Tag, Typography } from 'antd';
import type { Channel, MismatchCell } from '@dialsheet/common';
import { usePageShortcuts, type PageShortcut } from '@/components/shortcuts/page-shortcuts';
import { formatTime } from '../utils/sheet-format';
import { cellKey } from '../utils/sheet-grid';
import type { RenderFrame } from './frame-target';
import { PassEntry } from './pass-entry';
import { ReadingText } from './reading-text';
import { ResolutionFacts } from './resolution-facts';
import { ResolutionForm, type ResolutionFormHandle } from './resolution-form';

interface ResolutionDrawerProps {
  sheetId: string;
  cell: MismatchCell;
  channel: Channel;
  /** "3 of 12" in the title. */
  position: { index: number; count: number };
  decimalComma: boolean;
  canResolve: boolean;
  nameOf: (userId: string) => string | null;
  renderFrame?: RenderFrame;
  onClose: () => void;
}

type FrameChoice = 'row' | 'pass1' | 'pass2';

const GROUP = 'Resolution';

function firstChoice(cell: MismatchCell): FrameChoice {
  if (cell.pass2.frameTime !== null) return 'pass2';
  if (cell.pass1.frameTime !== null) return 'pass1';
  return 'row';
}

/** One mismatched cell against its frame: both entries, the frame each was read from, and the resolution. */
export function ResolutionDrawer({ sheetId, cell, channel, position, decimalComma, canResolve, nameOf, renderFrame, onClose }: ResolutionDrawerProps) {
  const key = cellKey(cell.rowIndex, cell.channelId);
  // The drawer stays open (and the video loaded) while j / k move to another cell; the frame
  // choice starts afresh for each cell.
  const [choice, setChoice] = useState<{ key: string; frame: FrameChoice }>(() => ({ key, frame: firstChoice(cell) }));
  const frame = choice.key === key ? choice.frame : firstChoice(cell);
  const setFrame = (next: FrameChoice) => setChoice({ key, frame: next });
  const form = useRef<ResolutionFormHandle>(null);
  const cellRef = useRef(cell);
  useEffect(() => {
    cellRef.current = cell;
  }, [cell]);
  const videoTime = frame === 'pass1' ? cell.pass1.frameTime : frame === 'pass2' ? cell.pass2.frameTime : null;

  const shortcuts = useMemo<PageShortcut[]>(
    () =>
      canResolve
        ? [
            { keys: ['1'], group: GROUP, description: 'Use the pass 1 entry as the resolved value', run: () => form.current?.fillValue(cellRef.current.pass1.rawText) },
            { keys: ['2'], group: GROUP, description: 'Use the pass 2 entry as the resolved value', run: () => form.current?.fillValue(cellRef.current.pass2.rawText) },
            { keys: ['v'], group: GROUP, description: 'Type the resolved value', run: () => form.current?.focusValue() },
            // Ctrl + Enter is handled by the form itself (shortcuts never take Ctrl); listed here so `?` shows it.
            { keys: ['Ctrl + Enter'], group: GROUP, description: 'Save the resolution', run: () => undefined },
          ]
        : [],
    [canResolve],
  );
  usePageShortcuts(shortcuts);

  return (
    <Drawer
      open
      onClose={onClose}
      size={760}
      mask={false}
      className="resolution-drawer"
      title={
        <span className="numeric">
          Row {cell.rowIndex + 1} · {formatTime(cell.testTime)} · {channel.symbol}{' '}
          <Typography.Text type="secondary">
            ({position.index + 1} of {position.count})
          </Typography.Text>
        </span>
      }
      extra={cell.resolution ? <Tag color="green">resolved</Tag> : <Tag color="orange">open</Tag>}
    >
      <div className="resolution-drawer-body">
        <ul className="mismatch-reasons">
          {cell.reasons.map((reason) => (
            <li key={reason}>{reason}</li>
          ))}
        </ul>
        {renderFrame ? (
          <div className="resolution-frame">
            <Segmented<FrameChoice>
              size="small"
              value={frame}
              onChange={setFrame}
              options={[
                { value: 'row', label: `Row time ${formatTime(cell.testTime)}` },
                { value: 'pass1', label: 'Pass 1 frame', disabled: cell.pass1.frameTime === null },
                { value: 'pass2', label: 'Pass 2 frame', disabled: cell.pass2.frameTime === null },
              ]}
            />
            {renderFrame({ testTime: cell.testTime, videoTime })}
          </div>
        ) : null}
        <div className="pass-entries">
          <PassEntry
            reading={cell.pass1}
            unit={channel.rawUnit}
            enteredByName={nameOf(cell.pass1.enteredBy)}
            onShowFrame={renderFrame ? () => setFrame('pass1') : undefined}
            onUse={canResolve ? () => form.current?.fillValue(cell.pass1.rawText) : undefined}
            useKey="1"
          />
          <PassEntry
            reading={cell.pass2}
            unit={channel.rawUnit}
            enteredByName={nameOf(cell.pass2.enteredBy)}
            onShowFrame={renderFrame ? () => setFrame('pass2') : undefined}
            onUse={canResolve ? () => form.current?.fillValue(cell.pass2.rawText) : undefined}
            useKey="2"
          />
        </div>
        {canResolve ? (
          <ResolutionForm key={key} ref={form} sheetId={sheetId} cell={cell} channel={channel} decimalComma={decimalComma} nameOf={nameOf} />
        ) : cell.resolution ? (
          <ResolutionFacts resolution={cell.resolution} unit={channel.rawUnit} byName={nameOf(cell.resolution.resolvedBy)} />
        ) : (
          <Typography.Paragraph type="secondary">
            Not resolved yet. The sheet&apos;s checker (once pass 2 is finished) or a lead records the resolved value.
          </Typography.Paragraph>
        )}
        <Typography.Paragraph type="secondary" className="card-footnote">
          <ReadingText text={cell.pass1.rawText} /> and <ReadingText text={cell.pass2.rawText} /> stay on record as typed; the resolution
          sits beside them.
        </Typography.Paragraph>
      </div>
    </Drawer>
  );
}

import { memo, useLayoutEffect, useMemo, useRef, useSyncExternalStore, type KeyboardEvent, type MutableRefObject } from 'react';
import type { InputRef } from 'antd';
import type { Channel, DisplayRegion } from '@dialsheet/common';
import { ChannelCell } from './channel-cell';
import type { CellsStore } from './cells-store';
import { checkCell, type CellCheck } from './entry-rows';

interface EntryCellsProps {
  store: CellsStore;
  channels: readonly Channel[];
  regionByChannel: ReadonlyMap<string, DisplayRegion>;
  decimalComma: boolean;
  inputRefs: ReadonlyArray<(input: InputRef | null) => void>;
  canvasRef: (index: number, canvas: HTMLCanvasElement | null) => void;
  onTextChange: (index: number, text: string) => void;
  onKeyDown: (index: number, event: KeyboardEvent<HTMLInputElement>) => void;
  focusCell: (index: number) => void;
  /** The input to focus once the cells on screen are the new ones; null: leave focus alone. */
  pendingFocus: MutableRefObject<number | null>;
  /** The row a person stepped to, until its inputs are on the page (for the benchmark marks). */
  stepRef: MutableRefObject<number | null>;
}

/** One input per channel of the current row, rendered from the cells store alone. */
export const EntryCells = memo(function EntryCells({
  store,
  channels,
  regionByChannel,
  decimalComma,
  inputRefs,
  canvasRef,
  onTextChange,
  onKeyDown,
  focusCell,
  pendingFocus,
  stepRef,
}: EntryCellsProps) {
  const view = useSyncExternalStore(store.subscribe, store.get, store.get);
  const { row, cells, baseline } = view;

  // One check per cell, kept while its text is unchanged, so a key typed re-renders one cell only.
  const checkCache = useRef(new Map<string, CellCheck>());
  const checks = useMemo(() => {
    const cache = checkCache.current;
    if (cache.size > 4 * channels.length + 64) cache.clear();
    return channels.map((channel, i) => {
      const text = cells.texts[i] ?? '';
      const key = `${channel.id}\u0000${decimalComma ? ',' : '.'}\u0000${text}`;
      let check = cache.get(key);
      if (!check) cache.set(key, (check = checkCell(text, channel, decimalComma)));
      return check;
    });
  }, [cells.texts, channels, decimalComma]);

  // Focus lands in the row's input once its text is on the page (selecting what is there), before
  // the browser handles another key; that is when typing can go on.
  useLayoutEffect(() => {
    const index = pendingFocus.current;
    if (index === null) return;
    pendingFocus.current = null;
    focusCell(index);
    if (stepRef.current === row) {
      stepRef.current = null;
      performance.mark('dialsheet:input-ready', { detail: { rowIndex: row } });
    }
  }, [focusCell, pendingFocus, row, stepRef, view]);

  return (
    <div className="entry-cells">
      {channels.map((channel, i) => (
        <ChannelCell
          key={channel.id}
          channel={channel}
          index={i}
          text={cells.texts[i] ?? ''}
          check={checks[i]}
          region={regionByChannel.get(channel.id)}
          changed={(cells.texts[i] ?? '') !== baseline[i]}
          inputRef={inputRefs[i]}
          canvasRef={canvasRef}
          onTextChange={onTextChange}
          onKeyDown={onKeyDown}
        />
      ))}
    </div>
  );
});

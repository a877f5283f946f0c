import { startTransition, useCallback, useDeferredValue, useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import { Button, Col, Row, Skeleton, Typography, type InputRef } from 'antd';
import { CheckOutlined } from '@ant-design/icons';
import {
  FLAG_TOKENS,
  toVideoTime,
  type Channel,
  type DisplayRegion,
  type Reading,
  type ReadingPass,
  type Sheet,
  type SheetRow,
  type SyncMarks,
} from '@dialsheet/common';
import { BufferedFramePlayer, type BufferedFramePlayerHandle } from '@/components/video/buffered-frame-player';
import type { FrameShownEvent } from '@/components/video/frame-buffer';
import { usePageShortcuts, type PageShortcut } from '@/components/shortcuts/page-shortcuts';
import { useEntryReadings } from '../../hooks/use-entry-readings';
import { useEntryKeys } from '../../hooks/use-entry-keys';
import { useSaveQueue } from '../../hooks/use-save-queue';
import type { QueueSnapshot, QueueStorage, SaveQueue, SendRow } from '../../stores/save-queue';
import { formatTime } from '../../utils/sheet-format';
import { CellsStore, typedSomething } from './cells-store';
import { EntryCells } from './entry-cells';
import {
  cellsForRow,
  checkCell,
  incompleteRows,
  resumeRow,
  rowBody,
  rowFrameIndices,
  rowState,
  sameAsStored,
  type RowCells,
  type RowState,
  type StoredReadings,
} from './entry-rows';
import { FinishPassDialog } from './finish-pass-dialog';
import { GoToRowDialog } from './go-to-row-dialog';
import { QueueStatus } from './queue-status';
import { drawRegionCrop, drawRegionCrops } from './region-crop';
import { RowList } from './row-list';
import { RowProblem } from './row-problem';

// The reader's (pass 1) and the checker's (pass 2, blind) screen: the video at the row's time,
// a zoomed crop of each display beside its input, and the keyboard doing everything.
//
// Keys, in an entry input:
//   Enter            next channel; on the last channel, save the row and step to the next row
//   Shift+Enter      previous channel; from the first, the previous row's last channel
//   Ctrl+U / Ctrl+M  flag the cell unreadable / ambiguous (#unreadable, #ambiguous; again clears)
//   PageDown/PageUp  next / previous row, keeping what was typed as an unsaved draft
//   ?                the shortcut sheet: '?' is never part of a reading, so it needs no escape
// Anywhere on the screen:
//   Alt+← / Alt+→ and Ctrl+, / Ctrl+.   one frame back / on, to find a settled digit
//   Ctrl+G           go to a row by number
// Each step marks dialsheet:step-start, dialsheet:frame-shown and dialsheet:input-ready for the
// step benchmark.

export interface EntryVideoSource {
  src: string;
  poster?: string | null;
  /** The proxy's frame presentation times (s). */
  frameTimes: readonly number[];
  fallbackFrameDuration?: number;
  aspectRatio?: number;
  sync: SyncMarks;
}

export interface EntryScreenProps {
  sheet: Sheet;
  pass: ReadingPass;
  userId: string;
  rows: readonly SheetRow[];
  /** The sheet's channels in entry order. */
  channels: readonly Channel[];
  regions: readonly DisplayRegion[];
  decimalComma: boolean;
  /** The person's own pass, as stored (never the other pass). */
  readings: readonly Reading[];
  video: EntryVideoSource;
  onMediaError?: () => void;
  /** Tests replace the browser's storage and the network call. */
  queueStorage?: QueueStorage;
  sendRow?: SendRow;
}

interface StepTag {
  rowIndex: number;
  /** True for a step the person made (marked for the benchmark); false for the first frame. */
  step: boolean;
}

/** Opens the app's shortcut sheet, which listens for '?' outside text fields. */
function openShortcutSheet(): void {
  document.body.dispatchEvent(new KeyboardEvent('keydown', { key: '?', bubbles: true, cancelable: true }));
}

const NO_ROWS: readonly number[] = [];

/**
 * Runs `work` once the browser has painted its next frame: work a step can put off (queueing the
 * saved row, whose state re-renders much of the screen) must not hold up the new frame.
 */
function afterNextPaint(work: () => void): void {
  if (typeof requestAnimationFrame === 'function') requestAnimationFrame(() => setTimeout(work, 0));
  else setTimeout(work, 0);
}

function sameTexts(a: readonly string[], b: readonly string[]): boolean {
  return a.length === b.length && a.every((text, i) => text === b[i]);
}

export function EntryScreen(props: EntryScreenProps) {
  const { sheet, pass, userId, readings, queueStorage, sendRow } = props;
  const { stored, revision, apply } = useEntryReadings(readings);
  const { queue, snapshot } = useSaveQueue({ userId, sheetId: sheet.id, pass, onAck: apply, storage: queueStorage, send: sendRow });
  if (!queue || !snapshot.restored) {
    return (
      <div aria-busy="true">
        <Typography.Text type="secondary">Reading back rows this browser still has to send…</Typography.Text>
        <Skeleton active paragraph={{ rows: 8 }} />
      </div>
    );
  }
  return <EntryWorkspace {...props} stored={stored} revision={revision} queue={queue} snapshot={snapshot} />;
}

interface WorkspaceProps extends EntryScreenProps {
  stored: StoredReadings;
  revision: number;
  queue: SaveQueue;
  snapshot: QueueSnapshot;
}

function EntryWorkspace({ sheet, pass, rows, channels, regions, decimalComma, video, onMediaError, stored, revision, queue, snapshot }: WorkspaceProps) {
  const channelIds = useMemo(() => channels.map((c) => c.id), [channels]);
  const lastChannel = channels.length - 1;
  const lastRow = rows.length - 1;
  const rowFrames = useMemo(() => rowFrameIndices(rows, video.sync, video.frameTimes), [rows, video.frameTimes, video.sync]);
  const regionByChannel = useMemo(() => new Map(regions.map((r) => [r.channelId, r])), [regions]);

  const rootRef = useRef<HTMLDivElement>(null);
  const playerRef = useRef<BufferedFramePlayerHandle>(null);
  const inputRefs = useRef<(InputRef | null)[]>([]);
  const canvases = useRef<(HTMLCanvasElement | null)[]>([]);
  /** Rows typed and left without saving (PageDown, Ctrl+G, clicking another row). */
  const drafts = useRef(new Map<number, RowCells>());
  const [draftRevision, setDraftRevision] = useState(0);

  /** What is saved or waiting to be sent for a row (drafts aside). */
  const savedCells = useCallback(
    (rowIndex: number): RowCells => cellsForRow(channelIds, stored.get(rowIndex), queue.getSnapshot().rows.get(rowIndex)),
    [channelIds, queue, stored],
  );
  const loadCells = useCallback((rowIndex: number): RowCells => drafts.current.get(rowIndex) ?? savedCells(rowIndex), [savedCells]);

  /** The row the screen around the inputs shows; it follows a step once the frame is painted. */
  const [row, setRow] = useState(() => resumeRow(rows.length, channelIds, stored, queue.getSnapshot().rows));
  /** The row and cells the inputs hold: handlers read these, never the rendered state. */
  const rowRef = useRef(row);
  const cellsRef = useRef<RowCells>(null as unknown as RowCells);
  /** The row's saved (or queued) texts: anything else in the inputs is typed and not yet saved. */
  const baselineRef = useRef<string[]>(null as unknown as string[]);
  const [cellsStore] = useState(() => {
    cellsRef.current = loadCells(row);
    baselineRef.current = savedCells(row).texts;
    return new CellsStore({ row, cells: cellsRef.current, baseline: baselineRef.current.slice() });
  });
  const pendingFocus = useRef<number | null>(0);
  /** The row a person stepped to, until its input is ready (for the benchmark marks). */
  const stepRef = useRef<number | null>(null);
  const [finishOpen, setFinishOpen] = useState(false);
  const [goToOpen, setGoToOpen] = useState(false);
  /** The input to return to once a dialog has closed. */
  const afterDialogFocus = useRef(0);

  /** Shows the inputs what rowRef, cellsRef and baselineRef now hold (re-rendering them alone). */
  const publishCells = useCallback(() => {
    cellsStore.set({ row: rowRef.current, cells: cellsRef.current, baseline: baselineRef.current.slice() });
  }, [cellsStore]);
  const updateCells = useCallback(
    (next: RowCells) => {
      cellsRef.current = next;
      publishCells();
    },
    [publishCells],
  );
  // Whether the current row holds typing not yet saved marks it in the row list, which can wait.
  const [typing, setTyping] = useState(() => typedSomething(cellsStore.get()));
  useEffect(
    () =>
      cellsStore.subscribe(() => {
        const now = typedSomething(cellsStore.get());
        startTransition(() => setTyping(now));
      }),
    [cellsStore],
  );

  const focusCell = useCallback((index: number) => {
    const input = inputRefs.current[index];
    input?.focus({ cursor: 'all' });
  }, []);

  const frameNow = useCallback((): number | null => playerRef.current?.frameOnScreen()?.pts ?? null, []);

  /** Keeps a row's unsaved typing as a draft; true when the drafts changed (render them). */
  const stashDraft = useCallback((rowIndex: number): boolean => {
    const current = cellsRef.current;
    if (!sameTexts(current.texts, baselineRef.current)) {
      drafts.current.set(rowIndex, { texts: current.texts.slice(), frames: current.frames.slice() });
      return true;
    }
    return drafts.current.delete(rowIndex);
  }, []);

  const goToRow = useCallback(
    (target: number, focusIndex = 0, afterPaint?: () => void) => {
      const next = Math.min(Math.max(target, 0), lastRow);
      const from = rowRef.current;
      if (next === from) {
        afterPaint?.();
        focusCell(focusIndex);
        return;
      }
      if (stashDraft(from)) setDraftRevision((n) => n + 1);
      performance.mark('dialsheet:step-start', { detail: { rowIndex: next } });
      stepRef.current = next;
      // The video moves first, straight from the key press; React renders the row's inputs
      // meanwhile (they must be right before the next key: a key typed into an input that is
      // about to change would be lost).
      const player = playerRef.current;
      player?.show(rowFrames[next], { rowIndex: next, step: true } satisfies StepTag);
      if (next < lastRow) player?.prefetch(rowFrames[next + 1]);
      const loaded = loadCells(next);
      baselineRef.current = savedCells(next).texts;
      rowRef.current = next;
      pendingFocus.current = Math.min(Math.max(focusIndex, 0), lastChannel);
      // The inputs change now (before another key can arrive; the cursor follows as soon as they
      // are on the page); the rest of the screen, and queueing the saved row (whose state
      // re-renders much of it), after the new frame is painted.
      updateCells(loaded);
      afterNextPaint(() => {
        afterPaint?.();
        setRow(rowRef.current);
      });
    },
    [focusCell, lastChannel, lastRow, loadCells, rowFrames, savedCells, stashDraft, updateCells],
  );

  // The first frame, and the next row's frame into the hidden element. Steps after this are
  // started from key handlers.
  useEffect(() => {
    const player = playerRef.current;
    const start = rowRef.current;
    if (!player || rowFrames.length === 0) return;
    player.show(rowFrames[start], { rowIndex: start, step: false } satisfies StepTag);
    if (start < rowFrames.length - 1) player.prefetch(rowFrames[start + 1]);
  }, [rowFrames]);

  const drawCrops = useCallback(
    (video: HTMLVideoElement) => {
      const targets = channels.flatMap((channel, i) => {
        const canvas = canvases.current[i];
        const region = regionByChannel.get(channel.id);
        return canvas && region ? [{ canvas, region }] : [];
      });
      drawRegionCrops(video, targets, () => playerRef.current?.visibleVideo() === video);
    },
    [channels, regionByChannel],
  );

  const onFrameShown = useCallback(
    (event: FrameShownEvent) => {
      const tag = event.tag as StepTag | null;
      if (tag && tag.step) {
        performance.mark('dialsheet:frame-shown', {
          detail: { rowIndex: tag.rowIndex, mediaTime: event.mediaTime, expectedPts: event.pts, wrongFramesSeen: event.wrongFramesSeen },
        });
      }
      // Copying a video frame into the crops costs milliseconds (tens without a GPU): after the
      // frame itself has been painted, never in front of it.
      const video = event.element;
      setTimeout(() => {
        if (playerRef.current?.visibleVideo() === video) drawCrops(video);
      }, 0);
    },
    [drawCrops],
  );

  const setText = useCallback(
    (index: number, text: string) => {
      const current = cellsRef.current;
      const texts = current.texts.slice();
      texts[index] = text;
      updateCells({ texts, frames: current.frames });
    },
    [updateCells],
  );

  /** The frame a cell was read at: the one on screen when its value was confirmed. */
  const commitFrame = useCallback(
    (index: number) => {
      const current = cellsRef.current;
      const changed = current.texts[index] !== baselineRef.current[index];
      if (current.frames[index] !== null && !changed) return;
      const frames = current.frames.slice();
      frames[index] = frameNow() ?? current.frames[index];
      // Frames are not shown: the next render (or the save) takes them from cellsRef.
      cellsRef.current = { texts: current.texts, frames };
    },
    [frameNow],
  );

  /**
   * Checks the row and takes it as saved; returns what queues it (run it now, or with the render
   * of the next row so the queue's own re-render waits for the frame), or null when a cell is
   * not a reading (the cursor goes there).
   */
  const saveRow = useCallback((): (() => void) | null => {
    const rowIndex = rowRef.current;
    const current = cellsRef.current;
    const firstError = channels.findIndex((channel, i) => checkCell(current.texts[i], channel, decimalComma).error !== null);
    if (firstError >= 0) {
      focusCell(firstError);
      return null;
    }
    const body = rowBody(channelIds, current, stored.get(rowIndex), frameNow());
    // Returning through a saved row without changing it sends nothing.
    const send = queue.getSnapshot().rows.has(rowIndex) || !sameAsStored(body, stored.get(rowIndex));
    const hadDraft = drafts.current.delete(rowIndex);
    baselineRef.current = current.texts.slice();
    publishCells();
    return () => {
      if (send) queue.enqueue(rowIndex, body);
      if (hadDraft) setDraftRevision((n) => n + 1);
    };
  }, [channelIds, channels, decimalComma, focusCell, frameNow, publishCells, queue, stored]);

  const forward = useCallback(
    (index: number) => {
      if (checkCell(cellsRef.current.texts[index], channels[index], decimalComma).error) {
        // The message is already under the input; the cursor stays for the correction.
        return;
      }
      commitFrame(index);
      if (index < lastChannel) {
        focusCell(index + 1);
        return;
      }
      const queueRow = saveRow();
      if (!queueRow) return;
      if (rowRef.current < lastRow) {
        goToRow(rowRef.current + 1, 0, queueRow);
      } else {
        queueRow();
        setFinishOpen(true);
      }
    },
    [channels, commitFrame, decimalComma, focusCell, goToRow, lastChannel, lastRow, saveRow],
  );

  const back = useCallback(
    (index: number) => {
      if (index > 0) focusCell(index - 1);
      else if (rowRef.current > 0) goToRow(rowRef.current - 1, lastChannel);
    },
    [focusCell, goToRow, lastChannel],
  );

  const toggleFlag = useCallback(
    (index: number, token: string) => {
      const text = cellsRef.current.texts[index];
      setText(index, text.trim() === token ? '' : token);
    },
    [setText],
  );

  const onCellKeyDown = useCallback(
    (index: number, event: KeyboardEvent<HTMLInputElement>) => {
      const { key } = event;
      const ctrl = event.ctrlKey || event.metaKey;
      if (key === 'Enter' && !ctrl && !event.altKey) {
        event.preventDefault();
        if (event.shiftKey) back(index);
        else forward(index);
        return;
      }
      if (ctrl && !event.altKey && !event.shiftKey && (key === 'u' || key === 'U' || key === 'm' || key === 'M')) {
        event.preventDefault();
        toggleFlag(index, key.toLowerCase() === 'u' ? FLAG_TOKENS.unreadable : FLAG_TOKENS.ambiguous);
        return;
      }
      if ((key === 'PageDown' || key === 'PageUp') && !ctrl && !event.altKey) {
        event.preventDefault();
        goToRow(rowRef.current + (key === 'PageDown' ? 1 : -1), 0);
        return;
      }
      if (key === '?' && !ctrl && !event.altKey) {
        event.preventDefault();
        openShortcutSheet();
      }
    },
    [back, forward, goToRow, toggleFlag],
  );

  const selectRow = useCallback((index: number) => goToRow(index, 0), [goToRow]);

  const stepFrames = useCallback((frames: number) => {
    playerRef.current?.step(frames);
  }, []);

  useEntryKeys(rootRef, { stepFrames, openGoTo: () => setGoToOpen(true) }, !finishOpen && !goToOpen);

  const shortcuts = useMemo<PageShortcut[]>(() => {
    const focusCurrent = () => focusCell(0);
    const group = 'Entry';
    return [
      { keys: ['Enter'], group, description: 'Next channel; on the last channel, save the row and go to the next row', run: focusCurrent },
      { keys: ['Enter'], shift: true, group, description: 'Previous channel (from the first, the previous row)', run: focusCurrent },
      { keys: ['Alt+←'], group, description: 'One frame back, to find a settled digit (also Ctrl+,)', run: () => undefined },
      { keys: ['Alt+→'], group, description: 'One frame on (also Ctrl+.)', run: () => undefined },
      { keys: ['Ctrl+U'], group, description: `Flag the cell unreadable (${FLAG_TOKENS.unreadable}); again clears it`, run: () => undefined },
      { keys: ['Ctrl+M'], group, description: `Flag the cell ambiguous, digits changing (${FLAG_TOKENS.ambiguous}); again clears it`, run: () => undefined },
      { keys: ['PageDown'], group, description: 'Next row (what you typed stays as an unsaved draft)', run: () => goToRow(rowRef.current + 1, 0) },
      { keys: ['PageUp'], group, description: 'Previous row', run: () => goToRow(rowRef.current - 1, 0) },
      { keys: ['Ctrl+G'], group, description: 'Go to a row by number', run: () => setGoToOpen(true) },
    ];
  }, [focusCell, goToRow]);
  usePageShortcuts(shortcuts, !finishOpen && !goToOpen);

  const setInputRef = useMemo(() => channels.map((_, i) => (input: InputRef | null) => void (inputRefs.current[i] = input)), [channels]);
  const setCanvas = useCallback((index: number, canvas: HTMLCanvasElement | null) => {
    canvases.current[index] = canvas;
    const element = playerRef.current?.visibleVideo();
    const region = canvas ? regionByChannel.get(channels[index]?.id ?? '') : undefined;
    if (canvas && element && region) drawRegionCrop(canvas, element, region);
  }, [channels, regionByChannel]);

  const states = useMemo<RowState[]>(() => {
    // The stored map and the drafts change in place; the revisions say when.
    void revision;
    void draftRevision;
    return rows.map((r) => rowState(channelIds, stored.get(r.index), snapshot.rows.get(r.index), drafts.current.has(r.index)));
  }, [channelIds, draftRevision, revision, rows, snapshot, stored]);
  const shownStates = useMemo(() => {
    if (!typing || snapshot.rows.has(row)) return states;
    const copy = states.slice();
    copy[row] = 'draft';
    return copy;
  }, [row, snapshot, states, typing]);

  const missing = useMemo(() => {
    // The stored map changes in place; revision says when.
    void revision;
    return finishOpen ? incompleteRows(rows.length, channelIds, stored, snapshot.rows) : NO_ROWS;
  }, [channelIds, finishOpen, revision, rows.length, snapshot, stored]);

  // The row list, the queue line and the readout's offset follow a step in a second, interruptible
  // render: the step's own render (inputs, focus) and the frame's paint come first.
  const listRow = useDeferredValue(row);
  const listStates = useDeferredValue(shownStates);
  const queueLine = useDeferredValue(snapshot);
  const referenceFrame = useDeferredValue(rowFrames[row] ?? null);
  const retryNow = useCallback(() => queue.retryNow(), [queue]);

  const queuedHere = snapshot.rows.get(row);
  const rowTime = rows[row]?.testTime;
  let rowVideoTime: number | null = null;
  try {
    rowVideoTime = rowTime === undefined ? null : toVideoTime(video.sync, rowTime);
  } catch {
    rowVideoTime = null;
  }

  const keepMine = () => queue.resolveConflict(row, 'mine');
  const takeStored = () => {
    const conflict = queuedHere?.conflict;
    queue.resolveConflict(row, 'stored');
    if (conflict?.current) {
      const index = channelIds.indexOf(conflict.channelId);
      if (index >= 0) {
        const current = cellsRef.current;
        const texts = current.texts.slice();
        const frames = current.frames.slice();
        texts[index] = conflict.current.rawText;
        frames[index] = conflict.current.frameTime;
        baselineRef.current[index] = conflict.current.rawText;
        updateCells({ texts, frames });
      }
    }
  };

  const closeFinish = useCallback(() => {
    afterDialogFocus.current = lastChannel;
    setFinishOpen(false);
  }, [lastChannel]);
  const finishGoToRow = useCallback(
    (index: number) => {
      setFinishOpen(false);
      afterDialogFocus.current = 0;
      goToRow(index, 0);
    },
    [goToRow],
  );
  const goTo = useCallback(
    (index: number) => {
      setGoToOpen(false);
      afterDialogFocus.current = 0;
      goToRow(index, 0);
    },
    [goToRow],
  );
  const closeGoTo = useCallback(() => {
    afterDialogFocus.current = 0;
    setGoToOpen(false);
  }, []);
  const refocus = useCallback(() => focusCell(afterDialogFocus.current), [focusCell]);
  // Closed dialogs still render their wrappers: only when something they show changes.
  const goToCurrent = goToOpen ? row : 0;
  const finishWaiting = finishOpen ? snapshot.waiting : 0;
  const dialogs = useMemo(
    () => (
      <>
        <FinishPassDialog
          open={finishOpen}
          sheetId={sheet.id}
          pass={pass}
          rowCount={rows.length}
          missingRows={missing}
          waiting={finishWaiting}
          onGoToRow={finishGoToRow}
          onClose={closeFinish}
          onAfterClose={refocus}
        />
        <GoToRowDialog open={goToOpen} rowCount={rows.length} current={goToCurrent} onGo={goTo} onClose={closeGoTo} onAfterClose={refocus} />
      </>
    ),
    [closeFinish, closeGoTo, finishGoToRow, finishOpen, finishWaiting, goTo, goToCurrent, goToOpen, missing, pass, refocus, rows.length, sheet.id],
  );

  return (
    <div className="entry-screen" ref={rootRef} data-testid="entry-screen">
      <div className="entry-toolbar">
        <Typography.Text strong>
          Pass {pass} {pass === 2 ? '(blind)' : ''}
        </Typography.Text>
        <QueueStatus snapshot={queueLine} onRetryNow={retryNow} />
        <Button icon={<CheckOutlined />} onClick={() => setFinishOpen(true)}>
          Finish pass…
        </Button>
      </div>
      <Row gutter={[16, 16]}>
        <Col xs={24} xl={14}>
          <BufferedFramePlayer
            ref={playerRef}
            src={video.src}
            poster={video.poster}
            frameTimes={video.frameTimes}
            fallbackFrameDuration={video.fallbackFrameDuration}
            aspectRatio={video.aspectRatio}
            sync={video.sync}
            referenceFrame={referenceFrame}
            onFrameShown={onFrameShown}
            onMediaError={onMediaError}
          />
          <RowList rows={rows} current={listRow} states={listStates} onSelect={selectRow} />
        </Col>
        <Col xs={24} xl={10}>
          <section className="entry-panel" aria-label={`Row ${row + 1}`}>
            <div className="entry-row-heading">
              <Typography.Title level={4} className="entry-row-title numeric" data-testid="entry-row-title">
                Row {row + 1} <span className="entry-row-of">of {rows.length}</span>
              </Typography.Title>
              <Typography.Text className="numeric" type="secondary">
                test {formatTime(rowTime)} · video {formatTime(rowVideoTime)}
              </Typography.Text>
            </div>
            <RowProblem queued={queuedHere} channels={channels} onResend={() => queue.resend(row)} onKeepMine={keepMine} onTakeStored={takeStored} />
            <EntryCells
              store={cellsStore}
              channels={channels}
              regionByChannel={regionByChannel}
              decimalComma={decimalComma}
              inputRefs={setInputRef}
              canvasRef={setCanvas}
              onTextChange={setText}
              onKeyDown={onCellKeyDown}
              focusCell={focusCell}
              pendingFocus={pendingFocus}
              stepRef={stepRef}
            />
            <Typography.Paragraph type="secondary" className="entry-keys-hint">
              <kbd>Enter</kbd> next · <kbd>Shift</kbd>+<kbd>Enter</kbd> back · <kbd>Alt</kbd>+<kbd>←</kbd>/<kbd>→</kbd> frame · <kbd>Ctrl</kbd>+<kbd>U</kbd>{' '}
              unreadable · <kbd>Ctrl</kbd>+<kbd>M</kbd> ambiguous · <kbd>?</kbd> all keys
            </Typography.Paragraph>
          </section>
        </Col>
      </Row>
      {dialogs}
    </div>
  );
}

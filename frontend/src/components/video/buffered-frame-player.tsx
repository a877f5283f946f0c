import { memo, useCallback, useEffect, useImperativeHandle, useMemo, useState, type ReactNode, type Ref } from 'react';
import { Alert, Tooltip, Typography } from 'antd';
import { formatTestTime, toTestTime, type SyncMarks } from '@dialsheet/common';
import { VideoElement } from './video-element';
import { FrameBuffer, type FrameOnScreen, type FrameShownEvent } from './frame-buffer';

// The entry screen's video: two elements over the same proxy, swapped on each step (see
// frame-buffer.ts). It has no controls of its own; the page drives it from its key handlers
// through the handle, and hears of each frame confirmed on screen through onFrameShown.

export interface BufferedFramePlayerHandle {
  /** Shows frame `index`; `tag` comes back with the frame-shown event. */
  show: (index: number, tag?: unknown) => void;
  /** Seeks the hidden element to frame `index` ahead of the next show(). */
  prefetch: (index: number) => void;
  /** Steps the visible element by whole frames; returns the frame index it goes to. */
  step: (frames: number) => number | null;
  /** The frame confirmed on screen now (what the person is looking at); null before the first. */
  frameOnScreen: () => FrameOnScreen | null;
  /** The element on screen. */
  visibleVideo: () => HTMLVideoElement | null;
}

export interface BufferedFramePlayerProps {
  src: string;
  poster?: string | null;
  /** Sorted presentation times of every frame (s). */
  frameTimes: readonly number[];
  fallbackFrameDuration?: number;
  /** Width ÷ height of the picture, so the box has its shape before the video loads. */
  aspectRatio?: number;
  /** When set, the readout shows test time beside video time. */
  sync?: SyncMarks | null;
  /** The frame the current row's time falls on, so the readout can say how far a step moved off it. */
  referenceFrame?: number | null;
  onFrameShown?: (event: FrameShownEvent) => void;
  onMediaError?: () => void;
  overlay?: ReactNode;
  ref?: Ref<BufferedFramePlayerHandle>;
}

function mediaErrorText(error: MediaError | null): string {
  switch (error?.code) {
    case 2:
      return 'The video stopped loading: the connection to the server broke.';
    case 3:
      return 'The browser could not decode this video.';
    case 4:
      return 'The browser cannot play this video, or the link to it is no longer valid.';
    default:
      return 'The video could not be played.';
  }
}

interface VideoPairProps {
  src: string;
  poster?: string | null;
  attachFirst: (element: HTMLVideoElement | null) => void;
  attachSecond: (element: HTMLVideoElement | null) => void;
}

// Re-rendering a react-player element rewrites its rate and volume; the pair only re-renders when
// its source changes, never on a step.
const VideoPair = memo(function VideoPair({ src, poster, attachFirst, attachSecond }: VideoPairProps) {
  const common = {
    src,
    poster: poster ?? undefined,
    controls: false,
    muted: true,
    playsInline: true,
    preload: 'auto' as const,
    width: '100%',
    height: '100%',
    className: 'buffered-player-video',
  };
  return (
    <>
      <VideoElement ref={attachFirst} {...common} />
      <VideoElement ref={attachSecond} {...common} />
    </>
  );
});

// Memoised: the entry screen re-renders on every key typed, the player only when its props change.
export const BufferedFramePlayer = memo(function BufferedFramePlayer({
  src,
  poster,
  frameTimes,
  fallbackFrameDuration,
  aspectRatio,
  sync,
  referenceFrame = null,
  onFrameShown,
  onMediaError,
  overlay,
  ref,
}: BufferedFramePlayerProps) {
  const [frame, setFrame] = useState<FrameOnScreen | null>(null);
  const [loaded, setLoaded] = useState(false);
  const [error, setError] = useState<string | null>(null);
  // The buffer outlives renders; it calls whatever handler the page passed last.
  const [callbacks] = useState<{ onFrameShown?: (event: FrameShownEvent) => void; onMediaError?: () => void }>(() => ({}));
  const [buffer] = useState(
    () =>
      new FrameBuffer(frameTimes, fallbackFrameDuration, {
        onShown: (event) => {
          setFrame((previous) => (previous && previous.index === event.index ? previous : { index: event.index, pts: event.pts }));
          callbacks.onFrameShown?.(event);
        },
      }),
  );
  useEffect(() => {
    callbacks.onFrameShown = onFrameShown;
    callbacks.onMediaError = onMediaError;
  }, [callbacks, onFrameShown, onMediaError]);

  useEffect(() => {
    buffer.setTimes(frameTimes, fallbackFrameDuration);
  }, [buffer, fallbackFrameDuration, frameTimes]);
  useEffect(() => {
    buffer.activate();
    return () => buffer.dispose();
  }, [buffer]);

  const [listened] = useState(() => new WeakSet<HTMLVideoElement>());
  const attachWithEvents = useCallback(
    (slot: 0 | 1, element: HTMLVideoElement | null) => {
      buffer.attach(slot, element);
      // A remounted ref (StrictMode, a new source) hands the same element again: listen once.
      if (!element || listened.has(element)) return;
      listened.add(element);
      const onLoadedData = () => setLoaded(true);
      const onError = () => {
        setError(mediaErrorText(element.error));
        callbacks.onMediaError?.();
      };
      const onLoadStart = () => setError(null);
      element.addEventListener('loadeddata', onLoadedData);
      element.addEventListener('error', onError);
      element.addEventListener('loadstart', onLoadStart);
      if (element.readyState >= 2) setLoaded(true);
    },
    [buffer, callbacks, listened],
  );
  const attachFirst = useCallback((element: HTMLVideoElement | null) => attachWithEvents(0, element), [attachWithEvents]);
  const attachSecond = useCallback((element: HTMLVideoElement | null) => attachWithEvents(1, element), [attachWithEvents]);

  useImperativeHandle(
    ref,
    () => ({
      show: (index, tag) => buffer.show(index, tag),
      prefetch: (index) => buffer.prefetch(index),
      step: (frames) => buffer.step(frames),
      frameOnScreen: () => buffer.frameOnScreen(),
      visibleVideo: () => buffer.visibleElement(),
    }),
    [buffer],
  );

  const testTime = useMemo(() => {
    if (!sync || !frame) return null;
    try {
      return toTestTime(sync, frame.pts);
    } catch {
      return null;
    }
  }, [frame, sync]);
  const offset = frame && referenceFrame !== null ? frame.index - referenceFrame : 0;

  return (
    <div className="buffered-player">
      <div className="buffered-player-screen" role="region" aria-label="Video" style={aspectRatio ? { aspectRatio: String(aspectRatio) } : undefined}>
        <VideoPair src={src} poster={poster} attachFirst={attachFirst} attachSecond={attachSecond} />
        {overlay}
        {!loaded && !error ? <div className="frame-player-overlay">Loading video…</div> : null}
      </div>
      {error ? <Alert type="error" showIcon className="frame-player-alert" title={error} /> : null}
      <dl className="frame-readout buffered-player-readout" aria-live="off">
        <div>
          <dt>Frame</dt>
          <dd className="numeric">
            <span data-testid="entry-frame-index">{frame ? frame.index : '–'}</span>
            <Typography.Text type="secondary"> of {frameTimes.length}</Typography.Text>
          </dd>
        </div>
        <div>
          <dt>Video</dt>
          <dd className="numeric">
            <Tooltip title={frame ? `${frame.pts.toFixed(6)} s, start of the frame` : undefined}>
              <span data-testid="entry-video-time">{frame ? formatTestTime(frame.pts) : '–'}</span>
            </Tooltip>
          </dd>
        </div>
        <div>
          <dt>Test</dt>
          <dd className="numeric">{testTime === null ? '–' : formatTestTime(testTime)}</dd>
        </div>
        <div>
          <dt className="visually-hidden">Offset from the row time</dt>
          <dd className="numeric">
            {offset !== 0 ? (
              <Tooltip title="Frames stepped away from the row's own time; the reading records the frame shown">
                <span className="frame-offset" data-testid="entry-frame-offset">
                  {offset > 0 ? `+${offset}` : offset} frame{Math.abs(offset) === 1 ? '' : 's'}
                </span>
              </Tooltip>
            ) : null}
          </dd>
        </div>
      </dl>
    </div>
  );
});

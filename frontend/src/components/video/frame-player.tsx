import { useCallback, useEffect, useImperativeHandle, useMemo, useRef, useState, type ReactNode, type Ref } from 'react';
import { VideoElement } from './video-element';
import { Alert, Button, Slider, Space, Tooltip, Typography } from 'antd';
import {
  CaretRightOutlined,
  FastBackwardOutlined,
  FastForwardOutlined,
  PauseOutlined,
  StepBackwardOutlined,
  StepForwardOutlined,
} from '@ant-design/icons';
import {
  formatTestTime,
  frameIndexAt,
  frameMidTime,
  seekTimeFor,
  stepFrame,
  toTestTime,
  type SyncMarks,
} from '@dialsheet/common';
import { usePageShortcuts, type PageShortcut } from '@/components/shortcuts/page-shortcuts';

// Frame-accurate stepping over a <video>. Positions come from the recording's stored frame
// presentation times, never index × nominal rate (phone video often has a variable rate), and a
// seek always lands in the middle of a frame: seeking to a frame's exact start showed the
// previous frame about half the time in Chromium. react-player is only the element: its ref is
// the <video>, and every seek writes currentTime directly from an event handler, never from render.

export interface FrameInfo {
  /** Frame index in presentation order, from 0. */
  index: number;
  /** Presentation time of the frame's start, seconds of video time. */
  pts: number;
  /** True once the browser has reported this frame on screen (requestVideoFrameCallback, or the seek finishing). */
  shown: boolean;
}

export interface FramePlayerHandle {
  /** Shows the frame on screen at video time `t` (s). */
  showTime: (t: number) => void;
  /** Moves by whole frames, negative for back. */
  stepFrames: (frames: number) => void;
  /** The frame now shown (or being sought to). */
  currentFrame: () => FrameInfo;
}

export interface FramePlayerProps {
  src: string;
  poster?: string | null;
  /** Sorted presentation times of every frame (s). */
  frameTimes: readonly number[];
  /** One frame's length for a one-frame video, e.g. 1 / nominal rate. */
  fallbackFrameDuration?: number;
  /** When set, test time is shown beside video time. */
  sync?: SyncMarks | null;
  /** Width ÷ height of the picture, so the box has its shape before the video loads. */
  aspectRatio?: number;
  /** Keyboard shortcuts (arrows, Space) while this player is on the page. */
  keyboard?: boolean;
  /**
   * The frame on screen changed. While playing, only the player's own readout follows every
   * frame; the page hears of the frame once playback stops, so it does not re-render 30 times a second.
   */
  onFrameChange?: (frame: FrameInfo) => void;
  /** The element could not load or play the source (for example, its signed link expired). */
  onMediaError?: () => void;
  /** Drawn over the picture, in a layer the size of the screen (display regions, for one). */
  overlay?: ReactNode;
  ref?: Ref<FramePlayerHandle>;
}

const SHORTCUT_GROUP = 'Video';

function clamp(value: number, min: number, max: number): number {
  return Math.min(Math.max(value, min), max);
}

function formatVideoTime(seconds: number): string {
  return formatTestTime(seconds);
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

export function FramePlayer({
  src,
  poster,
  frameTimes,
  fallbackFrameDuration,
  sync,
  aspectRatio,
  keyboard = true,
  onFrameChange,
  onMediaError,
  overlay,
  ref,
}: FramePlayerProps) {
  const times = frameTimes;
  const lastIndex = times.length - 1;
  const [video, setVideo] = useState<HTMLVideoElement | null>(null);
  const videoRef = useRef<HTMLVideoElement | null>(null);
  const [frame, setFrame] = useState<FrameInfo>(() => ({ index: 0, pts: times[0] ?? 0, shown: false }));
  const frameRef = useRef(frame);
  const [playing, setPlaying] = useState(false);
  const [loaded, setLoaded] = useState(false);
  const [error, setError] = useState<string | null>(null);
  /** Where the last seek went (middle of the wanted frame); steps count from here, not from currentTime. */
  const targetRef = useRef<number>(times.length > 0 ? frameMidTime(times, 0, fallbackFrameDuration) : 0);
  const frameCallbackRef = useRef<number | null>(null);
  const pausingForStepRef = useRef(false);
  const onFrameChangeRef = useRef(onFrameChange);
  const onMediaErrorRef = useRef(onMediaError);
  useEffect(() => {
    onFrameChangeRef.current = onFrameChange;
    onMediaErrorRef.current = onMediaError;
  }, [onFrameChange, onMediaError]);
  const notifiedRef = useRef<FrameInfo | null>(null);

  const publish = useCallback((next: FrameInfo) => {
    const previous = frameRef.current;
    if (previous.index !== next.index || previous.pts !== next.pts || previous.shown !== next.shown) {
      frameRef.current = next;
      setFrame(next);
    }
    const element = videoRef.current;
    if (element && !element.paused) return;
    const told = notifiedRef.current;
    if (told && told.index === next.index && told.pts === next.pts && told.shown === next.shown) return;
    notifiedRef.current = next;
    onFrameChangeRef.current?.(next);
  }, []);

  const frameAt = useCallback(
    (t: number): FrameInfo => {
      const index = Math.max(frameIndexAt(times, t), 0);
      return { index, pts: times[index], shown: false };
    },
    [times],
  );

  const cancelFrameCallback = useCallback(() => {
    const element = videoRef.current;
    if (element && frameCallbackRef.current !== null && 'cancelVideoFrameCallback' in element) {
      element.cancelVideoFrameCallback(frameCallbackRef.current);
    }
    frameCallbackRef.current = null;
  }, []);

  /**
   * Confirms what is on screen from the frame the compositor received (metadata.mediaTime); while
   * playing, keeps following every new frame.
   */
  const watchFrames = useCallback(
    (follow: boolean) => {
      const element = videoRef.current;
      if (!element || typeof element.requestVideoFrameCallback !== 'function') return;
      cancelFrameCallback();
      const onFrame: VideoFrameRequestCallback = (_now, metadata) => {
        frameCallbackRef.current = null;
        const onScreen = { ...frameAt(metadata.mediaTime), shown: true };
        publish(onScreen);
        // Keep watching while playing, and while a later seek is still on its way (quick
        // stepping can paint the frame of the seek before it first).
        const awaitingSeek = element.seeking && onScreen.index !== frameAt(targetRef.current).index;
        if ((follow && !element.paused) || awaitingSeek) {
          frameCallbackRef.current = element.requestVideoFrameCallback(onFrame);
        }
      };
      frameCallbackRef.current = element.requestVideoFrameCallback(onFrame);
    },
    [cancelFrameCallback, frameAt, publish],
  );

  const seekTo = useCallback(
    (seekTime: number) => {
      const element = videoRef.current;
      targetRef.current = seekTime;
      publish(frameAt(seekTime));
      if (!element) return;
      watchFrames(false);
      element.currentTime = seekTime;
    },
    [frameAt, publish, watchFrames],
  );

  /** Pauses for a step; the pause handler then leaves the position to the step. */
  const pauseForStep = useCallback((): void => {
    const element = videoRef.current;
    if (element && !element.paused) {
      pausingForStepRef.current = true;
      element.pause();
      targetRef.current = seekTimeFor(times, element.currentTime, fallbackFrameDuration);
    }
  }, [fallbackFrameDuration, times]);

  const stepFrames = useCallback(
    (frames: number) => {
      if (times.length === 0) return;
      pauseForStep();
      const next = stepFrame(times, targetRef.current, frames, fallbackFrameDuration);
      if (next.index === frameAt(targetRef.current).index) return;
      seekTo(next.seekTime);
    },
    [fallbackFrameDuration, frameAt, pauseForStep, seekTo, times],
  );

  const stepSeconds = useCallback(
    (seconds: number) => {
      if (times.length === 0) return;
      pauseForStep();
      const from = times[frameAt(targetRef.current).index];
      const wanted = clamp(from + seconds, times[0], times[lastIndex]);
      seekTo(seekTimeFor(times, wanted, fallbackFrameDuration));
    },
    [fallbackFrameDuration, frameAt, lastIndex, pauseForStep, seekTo, times],
  );

  const showTime = useCallback(
    (t: number) => {
      if (times.length === 0) return;
      pauseForStep();
      seekTo(seekTimeFor(times, t, fallbackFrameDuration));
    },
    [fallbackFrameDuration, pauseForStep, seekTo, times],
  );

  const togglePlay = useCallback(() => {
    const element = videoRef.current;
    if (!element) return;
    if (element.paused) {
      if (element.ended || frameRef.current.index >= lastIndex) element.currentTime = times[0] ?? 0;
      void element.play().catch((cause: unknown) => {
        // A pause() during the start rejects play(); that is not an error worth showing.
        if (!(cause instanceof DOMException && cause.name === 'AbortError')) setError(mediaErrorText(element.error));
      });
    } else {
      element.pause();
    }
  }, [lastIndex, times]);

  useImperativeHandle(ref, () => ({ showTime, stepFrames, currentFrame: () => frameRef.current }), [showTime, stepFrames]);

  // The element's own events: seeks finishing, play and pause, a new source after a link refresh.
  useEffect(() => {
    if (!video) return undefined;
    let seekedTimer: ReturnType<typeof setTimeout> | undefined;
    const onSeeked = () => {
      // Without requestVideoFrameCallback, a finished seek is the best word that the frame is up.
      // With it, the callback normally arrives first; a hidden tab paints nothing, though, so a
      // finished seek that no frame callback follows soon still counts.
      if (typeof video.requestVideoFrameCallback !== 'function') {
        publish({ ...frameAt(video.currentTime), shown: true });
        return;
      }
      clearTimeout(seekedTimer);
      seekedTimer = setTimeout(() => {
        if (!video.seeking && video.paused && !frameRef.current.shown) publish({ ...frameAt(video.currentTime), shown: true });
      }, 300);
    };
    const onPlay = () => {
      setPlaying(true);
      watchFrames(true);
    };
    const onPause = () => {
      setPlaying(false);
      if (pausingForStepRef.current) {
        pausingForStepRef.current = false;
        return;
      }
      // Playback stops anywhere inside a frame; settle on the middle of the frame on screen so the
      // number shown and the picture agree, and the next step counts from there.
      seekTo(seekTimeFor(times, video.currentTime, fallbackFrameDuration));
    };
    const onTimeUpdate = () => {
      if (!video.paused && typeof video.requestVideoFrameCallback !== 'function') publish({ ...frameAt(video.currentTime), shown: true });
    };
    const onLoadedMetadata = () => {
      // A new source (first load, or fresh signed links) starts at 0: put back the frame we were on.
      setError(null);
      seekTo(targetRef.current);
    };
    const onLoadedData = () => setLoaded(true);
    const onError = () => {
      setError(mediaErrorText(video.error));
      onMediaErrorRef.current?.();
    };
    video.addEventListener('seeked', onSeeked);
    video.addEventListener('play', onPlay);
    video.addEventListener('pause', onPause);
    video.addEventListener('ended', onPause);
    video.addEventListener('timeupdate', onTimeUpdate);
    video.addEventListener('loadedmetadata', onLoadedMetadata);
    video.addEventListener('loadeddata', onLoadedData);
    video.addEventListener('error', onError);
    return () => {
      video.removeEventListener('seeked', onSeeked);
      video.removeEventListener('play', onPlay);
      video.removeEventListener('pause', onPause);
      video.removeEventListener('ended', onPause);
      video.removeEventListener('timeupdate', onTimeUpdate);
      video.removeEventListener('loadedmetadata', onLoadedMetadata);
      video.removeEventListener('loadeddata', onLoadedData);
      video.removeEventListener('error', onError);
      clearTimeout(seekedTimer);
      cancelFrameCallback();
    };
  }, [cancelFrameCallback, fallbackFrameDuration, frameAt, publish, seekTo, times, video, watchFrames]);

  // An element that loaded before the listeners above were attached: put it on our frame once.
  useEffect(() => {
    if (!video) return;
    if (video.readyState >= 1) seekTo(targetRef.current);
    if (video.readyState >= 2) setLoaded(true);
    // Only for a new element; later re-renders must not seek (that would stop playback).
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [video]);

  // react-player does not pass a poster through to the element.
  useEffect(() => {
    if (video) video.poster = poster ?? '';
  }, [poster, video]);

  const setVideoElement = useCallback((node: HTMLVideoElement | null) => {
    videoRef.current = node;
    setVideo(node);
  }, []);

  const shortcuts = useMemo<PageShortcut[]>(
    () => [
      { keys: ['ArrowRight'], group: SHORTCUT_GROUP, description: 'Next frame', run: () => stepFrames(1) },
      { keys: ['ArrowLeft'], group: SHORTCUT_GROUP, description: 'Previous frame', run: () => stepFrames(-1) },
      { keys: ['ArrowRight'], shift: true, group: SHORTCUT_GROUP, description: 'One second on', run: () => stepSeconds(1) },
      { keys: ['ArrowLeft'], shift: true, group: SHORTCUT_GROUP, description: 'One second back', run: () => stepSeconds(-1) },
      { keys: [' '], group: SHORTCUT_GROUP, description: 'Play or pause', run: togglePlay },
    ],
    [stepFrames, stepSeconds, togglePlay],
  );
  usePageShortcuts(shortcuts, keyboard && times.length > 0);

  const testTime = useMemo(() => {
    if (!sync) return null;
    try {
      return toTestTime(sync, frame.pts);
    } catch {
      return null;
    }
  }, [frame.pts, sync]);

  return (
    <div className="frame-player">
      <div
        className="frame-player-screen"
        role="region"
        aria-label="Video"
        style={aspectRatio ? { aspectRatio: String(aspectRatio) } : undefined}
      >
        <VideoElement
          ref={setVideoElement}
          src={src}
          poster={poster ?? undefined}
          controls={false}
          muted
          playsInline
          preload="auto"
          width="100%"
          height="100%"
          className="frame-player-video"
        />
        {overlay}
        {!loaded && !error ? <div className="frame-player-overlay">Loading video…</div> : null}
      </div>
      {error ? <Alert type="error" showIcon className="frame-player-alert" title={error} /> : null}
      <div className="frame-player-controls">
        <Space size={4}>
          <Tooltip title="One second back (Shift + ←)">
            <Button icon={<FastBackwardOutlined />} aria-label="One second back" onClick={() => stepSeconds(-1)} />
          </Tooltip>
          <Tooltip title="Previous frame (←)">
            <Button icon={<StepBackwardOutlined />} aria-label="Previous frame" onClick={() => stepFrames(-1)} />
          </Tooltip>
          <Tooltip title={playing ? 'Pause (Space)' : 'Play (Space)'}>
            <Button
              type="primary"
              icon={playing ? <PauseOutlined /> : <CaretRightOutlined />}
              aria-label={playing ? 'Pause' : 'Play'}
              onClick={togglePlay}
            />
          </Tooltip>
          <Tooltip title="Next frame (→)">
            <Button icon={<StepForwardOutlined />} aria-label="Next frame" onClick={() => stepFrames(1)} />
          </Tooltip>
          <Tooltip title="One second on (Shift + →)">
            <Button icon={<FastForwardOutlined />} aria-label="One second on" onClick={() => stepSeconds(1)} />
          </Tooltip>
        </Space>
        <dl className="frame-readout" aria-live="polite">
          <div>
            <dt>Frame</dt>
            <dd className="numeric">
              <span data-testid="frame-index" data-shown={frame.shown ? 'true' : 'false'}>
                {frame.index}
              </span>
              <Typography.Text type="secondary"> of {times.length}</Typography.Text>
            </dd>
          </div>
          <div>
            <dt>Video time</dt>
            <dd className="numeric">
              <Tooltip title={`${frame.pts.toFixed(6)} s, start of the frame`}>
                <span data-testid="video-time">{formatVideoTime(frame.pts)}</span>
              </Tooltip>
            </dd>
          </div>
          <div>
            <dt>Test time</dt>
            <dd className="numeric">
              {testTime === null ? (
                <Typography.Text type="secondary">not synced</Typography.Text>
              ) : (
                <span data-testid="test-time">{formatTestTime(testTime)}</span>
              )}
            </dd>
          </div>
          <div>
            <dt className="visually-hidden">Frame on screen</dt>
            <dd>
              <Tooltip title={frame.shown ? 'The browser confirmed this frame is on screen' : 'Finding the frame…'}>
                <span className={`frame-status-dot${frame.shown ? ' is-shown' : ''}`} aria-label={frame.shown ? 'Frame on screen' : 'Finding the frame'} />
              </Tooltip>
            </dd>
          </div>
        </dl>
      </div>
      {times.length > 1 ? (
        <Slider
          className="frame-player-scrubber"
          min={0}
          max={lastIndex}
          value={frame.index}
          aria-label="Position in the video"
          tooltip={{ formatter: (value) => (value === undefined ? null : `${formatVideoTime(times[value] ?? 0)} · frame ${value}`) }}
          onChange={(index: number) => {
            pauseForStep();
            seekTo(frameMidTime(times, clamp(index, 0, lastIndex), fallbackFrameDuration));
          }}
        />
      ) : null}
    </div>
  );
}

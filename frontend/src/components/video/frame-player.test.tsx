import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { useState } from 'react';
import { act, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { FramePlayer, type FrameInfo } from './frame-player';

/** 30 fps for 1 s, 15 fps for 1 s, 30 fps for 1 s, printed to the microsecond as ffprobe does. */
function variableRateTimes(): number[] {
  const times: number[] = [];
  for (let k = 0; k < 30; k++) times.push(Number((k / 30).toFixed(6)));
  for (let k = 0; k < 15; k++) times.push(Number((1 + k / 15).toFixed(6)));
  for (let k = 0; k < 30; k++) times.push(Number((2 + k / 30).toFixed(6)));
  return times;
}

// jsdom has no video pipeline. requestVideoFrameCallback is the browser's word that a frame was
// handed to the compositor; here the test plays the compositor and says which frame that was.
type FrameCallback = (now: number, metadata: { mediaTime: number }) => void;
let pending: Map<number, FrameCallback>;
let nextHandle: number;

function presentFrame(mediaTime: number): void {
  const callbacks = [...pending.values()];
  pending.clear();
  act(() => {
    for (const callback of callbacks) callback(performance.now(), { mediaTime });
  });
}

function setSeeking(video: HTMLVideoElement, seeking: boolean): void {
  Object.defineProperty(video, 'seeking', { value: seeking, configurable: true });
}

function setPaused(video: HTMLVideoElement, paused: boolean): void {
  Object.defineProperty(video, 'paused', { value: paused, configurable: true });
  act(() => {
    video.dispatchEvent(new Event(paused ? 'pause' : 'play'));
  });
}

beforeEach(() => {
  pending = new Map();
  nextHandle = 1;
  Object.defineProperty(HTMLVideoElement.prototype, 'requestVideoFrameCallback', {
    configurable: true,
    value(callback: FrameCallback) {
      const handle = nextHandle++;
      pending.set(handle, callback);
      return handle;
    },
  });
  Object.defineProperty(HTMLVideoElement.prototype, 'cancelVideoFrameCallback', {
    configurable: true,
    value(handle: number) {
      pending.delete(handle);
    },
  });
});

afterEach(() => {
  delete (HTMLVideoElement.prototype as Partial<HTMLVideoElement>).requestVideoFrameCallback;
  delete (HTMLVideoElement.prototype as Partial<HTMLVideoElement>).cancelVideoFrameCallback;
});

function renderPlayer(times: number[], onFrameChange?: (frame: FrameInfo) => void) {
  const view = render(
    <FramePlayer
      src="/api/media/rec/proxy?exp=1&sig=x"
      frameTimes={times}
      sync={{ first: { videoTime: 1, testTime: 0 } }}
      onFrameChange={onFrameChange}
    />,
  );
  const video = view.container.querySelector('video')!;
  return { ...view, video, user: userEvent.setup() };
}

const frameIndex = () => screen.getByTestId('frame-index');

describe('FramePlayer', () => {
  it('renders the media through one plain <video> element, paused and without native controls', () => {
    const { video } = renderPlayer(variableRateTimes());
    expect(video).toBeInstanceOf(HTMLVideoElement);
    expect(video.getAttribute('src')).toBe('/api/media/rec/proxy?exp=1&sig=x');
    expect(video.controls).toBe(false);
    expect(video.paused).toBe(true);
  });

  it('steps by frame timestamps across a frame-rate change, seeking to the middle of each frame', async () => {
    const times = variableRateTimes();
    const { video, user } = renderPlayer(times);
    video.dispatchEvent(new Event('loadedmetadata'));
    expect(video.currentTime).toBeCloseTo(times[1] / 2, 9);

    for (let i = 0; i < 30; i++) await user.keyboard('{ArrowRight}');
    expect(frameIndex()).toHaveTextContent('30');
    // Frame 30 starts the 15 fps stretch at 1.000 s and lasts 1/15 s; index × 30 fps would say 1.0 s → 1.033 s.
    expect(video.currentTime).toBeCloseTo(1 + 1 / 30, 6);
    expect(screen.getByTestId('video-time')).toHaveTextContent('00:01.000');
    expect(screen.getByTestId('test-time')).toHaveTextContent('00:00.000');

    // One second on from frame 30 (1.000 s) is the frame showing at 2.000 s: index 45, not 60.
    await user.keyboard('{Shift>}{ArrowRight}{/Shift}');
    expect(frameIndex()).toHaveTextContent('45');
    expect(video.currentTime).toBeCloseTo(2 + 1 / 60, 6);

    await user.keyboard('{ArrowLeft}');
    expect(frameIndex()).toHaveTextContent('44');
    expect(video.currentTime).toBeCloseTo((times[44] + times[45]) / 2, 6);

    // Clamped at the start.
    await user.keyboard('{Shift>}{ArrowLeft}{ArrowLeft}{ArrowLeft}{/Shift}');
    expect(frameIndex()).toHaveTextContent('0');
    await user.keyboard('{ArrowLeft}');
    expect(frameIndex()).toHaveTextContent('0');
  });

  it('marks a frame as on screen only when the browser presents it, following quick steps to the last one', async () => {
    const times = variableRateTimes();
    const seen: FrameInfo[] = [];
    const { video, user } = renderPlayer(times, (frame) => seen.push(frame));
    video.dispatchEvent(new Event('loadedmetadata'));
    presentFrame(times[0]);
    await waitFor(() => expect(frameIndex()).toHaveAttribute('data-shown', 'true'));

    await user.keyboard('{ArrowRight}');
    expect(frameIndex()).toHaveTextContent('1');
    expect(frameIndex()).toHaveAttribute('data-shown', 'false');

    // Two more quick steps; the browser is still seeking when it paints frame 2 (the middle step).
    await user.keyboard('{ArrowRight}{ArrowRight}');
    setSeeking(video, true);
    presentFrame(times[2] + 0.001);
    expect(frameIndex()).toHaveTextContent('2');
    expect(frameIndex()).toHaveAttribute('data-shown', 'true');
    // It keeps listening, and confirms the frame the last step asked for once that is painted.
    setSeeking(video, false);
    presentFrame(times[3]);
    expect(frameIndex()).toHaveTextContent('3');
    expect(frameIndex()).toHaveAttribute('data-shown', 'true');
    expect(seen[seen.length - 1]).toEqual({ index: 3, pts: times[3], shown: true });
  });

  it('leaves a playing video alone when the page re-renders, and tells the page the frame once it stops', () => {
    const times = variableRateTimes();
    const reported: FrameInfo[] = [];
    // A page that re-renders on every report and hands the player new callbacks each time.
    function Page() {
      const [, setReports] = useState(0);
      return (
        <FramePlayer
          src="/v"
          frameTimes={times}
          onFrameChange={(frame) => {
            reported.push(frame);
            setReports((n) => n + 1);
          }}
          onMediaError={() => undefined}
        />
      );
    }
    const { container, rerender } = render(<Page />);
    const video = container.querySelector('video')!;
    Object.defineProperty(video, 'readyState', { value: 4, configurable: true });
    video.dispatchEvent(new Event('loadedmetadata'));
    presentFrame(times[0]);
    const reportsBeforePlay = reported.length;

    setPaused(video, false);
    video.currentTime = 1.5;
    // 1.5 s lies in the 15 fps stretch: frame 30 + 7 = 37 (starts 1.466667 s).
    presentFrame(times[37] + 0.01);
    rerender(<Page />);
    expect(video.currentTime).toBe(1.5);
    expect(frameIndex()).toHaveTextContent('37');
    expect(reported).toHaveLength(reportsBeforePlay);

    setPaused(video, true);
    // Settled on the middle of the frame on screen, and the page hears of it.
    expect(video.currentTime).toBeCloseTo((times[37] + times[38]) / 2, 6);
    expect(reported[reported.length - 1]).toMatchObject({ index: 37, pts: times[37] });
  });

  it('leaves arrow keys to a text field being typed in; its buttons step as the keys do', async () => {
    const times = variableRateTimes();
    render(
      <>
        <input aria-label="note" />
        <FramePlayer src="/v" frameTimes={times} />
      </>,
    );
    const user = userEvent.setup();
    await user.click(screen.getByLabelText('note'));
    await user.keyboard('{ArrowRight}');
    expect(frameIndex()).toHaveTextContent('0');

    await user.click(screen.getByRole('button', { name: 'Next frame' }));
    await user.click(screen.getByRole('button', { name: 'One second on' }));
    expect(frameIndex()).toHaveTextContent('30');
  });
});

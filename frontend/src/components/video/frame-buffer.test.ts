import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { frameIndexAt } from '@dialsheet/common';
import { FrameBuffer, SWAP_WAIT_LIMIT_MS, type FrameShownEvent } from './frame-buffer';

/** 30 fps for 1 s then 15 fps for 1 s (variable rate), printed to the microsecond. */
const times = [
  ...Array.from({ length: 30 }, (_, k) => Number((k / 30).toFixed(6))),
  ...Array.from({ length: 15 }, (_, k) => Number((1 + k / 15).toFixed(6))),
];
const mid = (k: number) => (times[k] + times[k + 1]) / 2;

// The test plays the decoder: a frame callback reports the frame an element's currentTime falls in.
type FrameCallback = (now: number, metadata: { mediaTime: number }) => void;
let pending: Map<number, { video: HTMLVideoElement; callback: FrameCallback }>;
let nextHandle: number;

function present(video: HTMLVideoElement, mediaTime?: number): void {
  for (const [handle, entry] of [...pending]) {
    if (entry.video !== video) continue;
    pending.delete(handle);
    entry.callback(performance.now(), { mediaTime: mediaTime ?? times[Math.max(frameIndexAt(times, video.currentTime), 0)] });
  }
}

function seeked(video: HTMLVideoElement): void {
  video.dispatchEvent(new Event('seeked'));
}

function setup(withFrameCallback = true) {
  if (withFrameCallback) {
    Object.defineProperty(HTMLVideoElement.prototype, 'requestVideoFrameCallback', {
      configurable: true,
      value(this: HTMLVideoElement, callback: FrameCallback) {
        const handle = nextHandle++;
        pending.set(handle, { video: this, callback });
        return handle;
      },
    });
    Object.defineProperty(HTMLVideoElement.prototype, 'cancelVideoFrameCallback', {
      configurable: true,
      value: (handle: number) => pending.delete(handle),
    });
  }
  const shown: FrameShownEvent[] = [];
  const buffer = new FrameBuffer(times, undefined, { onShown: (event) => shown.push(event) });
  const a = document.createElement('video');
  const b = document.createElement('video');
  buffer.attach(0, a);
  buffer.attach(1, b);
  return { buffer, a, b, shown };
}

beforeEach(() => {
  pending = new Map();
  nextHandle = 1;
  vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'requestAnimationFrame'] });
});

afterEach(() => {
  vi.useRealTimers();
  delete (HTMLVideoElement.prototype as Partial<HTMLVideoElement>).requestVideoFrameCallback;
  delete (HTMLVideoElement.prototype as Partial<HTMLVideoElement>).cancelVideoFrameCallback;
});

describe('FrameBuffer', () => {
  it('seeks to the middle of the frame and counts it shown only when its frame reaches the screen', () => {
    const { buffer, a, shown } = setup();
    buffer.show(31, 'row 0');
    expect(a.currentTime).toBeCloseTo(mid(31), 9);
    expect(buffer.frameOnScreen()).toBeNull();

    // A quick seek can paint an older frame first: not the one asked for.
    present(a, times[29]);
    expect(shown).toHaveLength(0);
    present(a);
    expect(shown).toHaveLength(1);
    expect(shown[0]).toMatchObject({ index: 31, pts: times[31], mediaTime: times[31], wrongFramesSeen: 1, via: 'seek', tag: 'row 0', element: a });
    expect(buffer.frameOnScreen()).toEqual({ index: 31, pts: times[31] });
  });

  it('swaps in the hidden element when it already holds the frame, without seeking the visible one', () => {
    const { buffer, a, b, shown } = setup();
    buffer.show(10);
    present(a);
    buffer.prefetch(40);
    // Frame 40 is in the 15 fps stretch: its middle is 1/30 s after its start, not 1/60 s.
    expect(b.currentTime).toBeCloseTo(mid(40), 9);
    expect(b.style.visibility).toBe('hidden');
    present(b);
    const visibleTime = a.currentTime;

    buffer.show(40, 'row 1');
    expect(a.currentTime).toBe(visibleTime);
    expect(b.style.visibility).toBe('visible');
    expect(a.style.visibility).toBe('hidden');
    expect(b.dataset.onScreen).toBe('true');
    // The frame read from now on is the swapped-in one.
    expect(buffer.frameOnScreen()).toEqual({ index: 40, pts: times[40] });
    expect(shown).toHaveLength(1);
    vi.advanceTimersToNextFrame();
    expect(shown.at(-1)).toMatchObject({ index: 40, via: 'swap', tag: 'row 1', element: b, wrongFramesSeen: 0 });

    // The element now hidden is free for the row after.
    buffer.prefetch(42);
    expect(a.currentTime).toBeCloseTo(mid(42), 9);
    expect(buffer.visibleElement()).toBe(b);
  });

  it('waits for a hidden seek still under way, and seeks the visible element if it takes too long', () => {
    const { buffer, a, b, shown } = setup();
    buffer.show(5);
    present(a);
    buffer.prefetch(20);

    // Typed faster than the seek: the swap waits, the old frame stays on screen meanwhile.
    buffer.show(20, 'quick');
    expect(a.style.visibility).toBe('visible');
    expect(buffer.frameOnScreen()?.index).toBe(5);
    present(b);
    expect(b.style.visibility).toBe('visible');
    vi.advanceTimersToNextFrame();
    expect(shown.at(-1)).toMatchObject({ index: 20, via: 'swap', tag: 'quick' });

    // A hidden element that never gets there (stalled request): the visible one seeks instead.
    buffer.prefetch(25);
    buffer.show(25, 'stalled');
    expect(b.currentTime).toBeCloseTo(mid(20), 9);
    vi.advanceTimersByTime(SWAP_WAIT_LIMIT_MS);
    expect(b.currentTime).toBeCloseTo(mid(25), 9);
    present(b);
    expect(shown.at(-1)).toMatchObject({ index: 25, via: 'seek', tag: 'stalled', element: b });
  });

  it('seeks the visible element for a frame nobody prefetched, and steps by whole frames from there', () => {
    const { buffer, a, b, shown } = setup();
    buffer.show(3);
    present(a);
    buffer.prefetch(12);
    buffer.show(33, 'jump');
    expect(a.currentTime).toBeCloseTo(mid(33), 9);
    expect(b.currentTime).toBeCloseTo(mid(12), 9);
    present(a);
    expect(shown.at(-1)).toMatchObject({ index: 33, via: 'seek', tag: 'jump' });

    expect(buffer.step(1)).toBe(34);
    expect(a.currentTime).toBeCloseTo(mid(34), 9);
    expect(buffer.step(-2)).toBe(32);
    present(a);
    expect(shown.at(-1)).toMatchObject({ index: 32, tag: null });
    // Held at the ends.
    expect(buffer.step(-100)).toBe(0);
    expect(buffer.step(1000)).toBe(times.length - 1);
  });

  it('without frame callbacks, counts a finished seek as the frame shown', () => {
    const { buffer, a, b, shown } = setup(false);
    buffer.show(7, 'plain');
    expect(shown).toHaveLength(0);
    seeked(a);
    expect(shown.at(-1)).toMatchObject({ index: 7, mediaTime: times[7], tag: 'plain' });
    buffer.prefetch(8);
    seeked(b);
    buffer.show(8);
    expect(b.style.visibility).toBe('visible');
  });

  it('puts each element back on its frame when its source reloads (new signed link)', () => {
    const { buffer, a, b } = setup();
    buffer.show(15);
    buffer.prefetch(16);
    a.currentTime = 0;
    b.currentTime = 0;
    a.dispatchEvent(new Event('loadedmetadata'));
    b.dispatchEvent(new Event('loadedmetadata'));
    expect(a.currentTime).toBeCloseTo(mid(15), 9);
    expect(b.currentTime).toBeCloseTo(mid(16), 9);
  });
});

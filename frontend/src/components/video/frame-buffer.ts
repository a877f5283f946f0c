import { frameIndexAt, frameMidTime } from '@dialsheet/common';

// Two <video> elements over the same file, one on screen and one hidden. While the person types,
// the hidden one is sought to the frame they will want next; when they step, the two swap places,
// so the new frame is on screen in the next paint instead of after a seek (measured in headless
// Chromium on a 1-s-GOP proxy: p95 17–28 ms against 46 ms for a plain seek, 451 ms on a camera
// file). Frames are addressed by index into the recording's stored presentation times, and every
// seek lands in the middle of its frame: a seek to a frame's exact start showed the previous frame
// about half the time. A frame counts as on screen once requestVideoFrameCallback reports its
// mediaTime (or, for the hidden element and for browsers without the callback, once its seek ends).
// No React here: the player component attaches the elements, the page calls show/prefetch/step
// from its key handlers, and nothing ever seeks from a render.

export type SlotId = 0 | 1;

export interface FrameOnScreen {
  /** Frame index in presentation order. */
  index: number;
  /** Presentation time of the frame's start (s): what a reading records as its frame time. */
  pts: number;
}

export interface FrameShownEvent extends FrameOnScreen {
  /** The frame time the browser reported: rVFC's mediaTime, or the start of the frame a finished seek landed in. */
  mediaTime: number;
  /** Frames that reached the element on the way to this one (quick seeks paint stale frames). */
  wrongFramesSeen: number;
  /** 'swap': the hidden element already held it; 'seek': the visible element sought to it. */
  via: 'swap' | 'seek';
  /** Whatever the caller passed to show(); null for frame steps and reloads. */
  tag: unknown;
  /** The element now on screen (to draw crops from). */
  element: HTMLVideoElement;
}

export interface FrameBufferCallbacks {
  onShown?: (event: FrameShownEvent) => void;
}

interface Slot {
  element: HTMLVideoElement | null;
  /** Frame the element was last sent to; -1 before the first seek. */
  target: number;
  ready: boolean;
  mediaTime: number | null;
  wrong: number;
  frameCallback: number | null;
  seekedTimer: ReturnType<typeof setTimeout> | null;
  detach: (() => void) | null;
}

interface PendingSwap {
  index: number;
  tag: unknown;
  timer: ReturnType<typeof setTimeout> | null;
}

/**
 * How long a step waits for the hidden element's seek to the same frame before seeking the visible
 * one instead. Waiting is normally faster than starting over (the seek is under way); the limit
 * only covers a hidden element that got stuck (a stalled request, a decoder error).
 */
export const SWAP_WAIT_LIMIT_MS = 400;

/** A visible element whose seek ended but painted nothing (hidden tab) counts as shown after this. */
const SEEKED_FALLBACK_MS = 250;

function newSlot(): Slot {
  return { element: null, target: -1, ready: false, mediaTime: null, wrong: 0, frameCallback: null, seekedTimer: null, detach: null };
}

const hasFrameCallback = (element: HTMLVideoElement): boolean => typeof element.requestVideoFrameCallback === 'function';

const nextPaint = (run: () => void): void => {
  if (typeof requestAnimationFrame === 'function') requestAnimationFrame(() => run());
  else setTimeout(run, 0);
};

export class FrameBuffer {
  private times: readonly number[];
  private fallbackDuration: number | undefined;
  private readonly callbacks: FrameBufferCallbacks;
  private readonly slots: [Slot, Slot] = [newSlot(), newSlot()];
  private visible: SlotId = 0;
  private pendingSwap: PendingSwap | null = null;
  /** A prefetch asked for while a swap waits: it applies to the element that ends up hidden. */
  private pendingPrefetch: number | null = null;
  /** The visible element's seek in progress and what show() attached to it. */
  private pendingShow: { tag: unknown } | null = null;
  private confirmed: FrameOnScreen | null = null;
  private disposed = false;

  constructor(times: readonly number[], fallbackDuration: number | undefined, callbacks: FrameBufferCallbacks = {}) {
    this.times = times;
    this.fallbackDuration = fallbackDuration;
    this.callbacks = callbacks;
  }

  setTimes(times: readonly number[], fallbackDuration?: number): void {
    this.times = times;
    this.fallbackDuration = fallbackDuration;
  }

  /** Hands an element to a slot (null when React removes it). */
  attach(slotId: SlotId, element: HTMLVideoElement | null): void {
    const slot = this.slots[slotId];
    if (slot.element === element && slot.detach) return;
    this.release(slot);
    slot.element = element;
    if (!element) return;
    this.applyVisibility();
    const onSeeked = () => this.onSeeked(slotId);
    // A (re)loaded source starts at 0: put the element back on its frame.
    const onLoadedMetadata = () => {
      if (slot.target >= 0) this.seek(slotId, slot.target);
    };
    element.addEventListener('seeked', onSeeked);
    element.addEventListener('loadedmetadata', onLoadedMetadata);
    slot.detach = () => {
      element.removeEventListener('seeked', onSeeked);
      element.removeEventListener('loadedmetadata', onLoadedMetadata);
    };
    if (slot.target >= 0) this.seek(slotId, slot.target);
  }

  /** Puts frame `index` on screen: by swapping when the hidden element holds it, else by seeking. */
  show(index: number, tag: unknown = null): void {
    if (this.times.length === 0 || this.disposed) return;
    const target = this.clampIndex(index);
    const shown = this.slots[this.visible];
    const hiddenId = this.hiddenId();
    const hidden = this.slots[hiddenId];
    if (this.pendingSwap && this.pendingSwap.index !== target) this.cancelSwap();

    if (shown.target === target && !this.pendingSwap) {
      if (shown.ready) this.emitShown(this.visible, 'seek', tag);
      else this.pendingShow = { tag };
      return;
    }
    if (hidden.element && hidden.target === target) {
      if (this.pendingSwap) {
        this.pendingSwap.tag = tag;
        return;
      }
      this.pendingSwap = { index: target, tag, timer: null };
      if (hidden.ready) {
        this.swap();
      } else {
        // Its seek is under way: waiting for it beats starting a new one on the visible element.
        this.pendingSwap.timer = setTimeout(() => this.giveUpSwap(), SWAP_WAIT_LIMIT_MS);
      }
      return;
    }
    this.pendingShow = { tag };
    this.seek(this.visible, target);
  }

  /** Seeks the hidden element to frame `index`, ready for the next show(). */
  prefetch(index: number): void {
    if (this.times.length === 0 || this.disposed) return;
    const target = this.clampIndex(index);
    if (this.pendingSwap) {
      this.pendingPrefetch = target;
      return;
    }
    const hiddenId = this.hiddenId();
    const hidden = this.slots[hiddenId];
    if (!hidden.element || hidden.target === target || this.slots[this.visible].target === target) return;
    this.seek(hiddenId, target);
  }

  /** Moves the visible element by whole frames (to find a settled digit); returns the new frame index. */
  step(frames: number): number | null {
    if (this.times.length === 0 || this.disposed) return null;
    const swapping = this.pendingSwap;
    const from = swapping ? swapping.index : this.slots[this.visible].target;
    if (swapping) this.cancelSwap();
    if (from < 0) return null;
    const target = this.clampIndex(from + frames);
    if (target === this.slots[this.visible].target) return target;
    this.pendingShow = { tag: null };
    this.seek(this.visible, target);
    return target;
  }

  /** The frame the browser last confirmed on the visible element; null before the first one. */
  frameOnScreen(): FrameOnScreen | null {
    return this.confirmed;
  }

  /** The frame the screen is on or on its way to. */
  targetFrame(): number {
    return this.pendingSwap ? this.pendingSwap.index : this.slots[this.visible].target;
  }

  visibleElement(): HTMLVideoElement | null {
    return this.slots[this.visible].element;
  }

  /** Stops listening and seeking; the elements stay attached so activate() can resume. */
  dispose(): void {
    this.disposed = true;
    this.cancelSwap();
    for (const slot of this.slots) this.release(slot);
  }

  /** Resumes after dispose() (React runs effects twice in development). */
  activate(): void {
    if (!this.disposed) return;
    this.disposed = false;
    this.slots.forEach((slot, id) => {
      if (slot.element && !slot.detach) this.attach(id as SlotId, slot.element);
    });
  }

  private hiddenId(): SlotId {
    return this.visible === 0 ? 1 : 0;
  }

  private clampIndex(index: number): number {
    return Math.min(Math.max(Math.round(index), 0), this.times.length - 1);
  }

  private release(slot: Slot): void {
    this.cancelFrameCallback(slot);
    if (slot.seekedTimer !== null) clearTimeout(slot.seekedTimer);
    slot.seekedTimer = null;
    slot.detach?.();
    slot.detach = null;
  }

  private cancelFrameCallback(slot: Slot): void {
    if (slot.element && slot.frameCallback !== null && typeof slot.element.cancelVideoFrameCallback === 'function') {
      slot.element.cancelVideoFrameCallback(slot.frameCallback);
    }
    slot.frameCallback = null;
  }

  private seek(slotId: SlotId, index: number): void {
    const slot = this.slots[slotId];
    slot.target = index;
    slot.ready = false;
    slot.mediaTime = null;
    slot.wrong = 0;
    if (slot.seekedTimer !== null) clearTimeout(slot.seekedTimer);
    slot.seekedTimer = null;
    const element = slot.element;
    if (!element) return;
    this.watch(slotId);
    element.currentTime = frameMidTime(this.times, index, this.fallbackDuration);
  }

  /** Follows the frames the element hands to the compositor until the wanted one arrives. */
  private watch(slotId: SlotId): void {
    const slot = this.slots[slotId];
    const element = slot.element;
    if (!element || !hasFrameCallback(element)) return;
    this.cancelFrameCallback(slot);
    const onFrame: VideoFrameRequestCallback = (_now, metadata) => {
      slot.frameCallback = null;
      if (slot.element !== element || slot.ready || this.disposed) return;
      const index = Math.max(frameIndexAt(this.times, metadata.mediaTime), 0);
      if (index === slot.target) {
        this.markReady(slotId, metadata.mediaTime);
      } else {
        slot.wrong += 1;
        slot.frameCallback = element.requestVideoFrameCallback(onFrame);
      }
    };
    slot.frameCallback = element.requestVideoFrameCallback(onFrame);
  }

  private onSeeked(slotId: SlotId): void {
    const slot = this.slots[slotId];
    const element = slot.element;
    if (!element || slot.ready || element.seeking || slot.target < 0) return;
    const index = Math.max(frameIndexAt(this.times, element.currentTime), 0);
    if (index !== slot.target) return;
    // The hidden element may paint nothing (and so get no frame callback); a finished seek has
    // always had the right frame decoded. The visible one waits briefly for its frame callback.
    // Reported as the frame's own time, as a frame callback's mediaTime would be.
    if (!hasFrameCallback(element) || slotId !== this.visible) {
      this.markReady(slotId, this.times[index]);
      return;
    }
    if (slot.seekedTimer !== null) clearTimeout(slot.seekedTimer);
    slot.seekedTimer = setTimeout(() => {
      slot.seekedTimer = null;
      if (!slot.ready && slot.element === element && !element.seeking && Math.max(frameIndexAt(this.times, element.currentTime), 0) === slot.target) {
        this.markReady(slotId, this.times[slot.target]);
      }
    }, SEEKED_FALLBACK_MS);
  }

  private markReady(slotId: SlotId, mediaTime: number): void {
    const slot = this.slots[slotId];
    slot.ready = true;
    slot.mediaTime = mediaTime;
    this.cancelFrameCallback(slot);
    if (slot.seekedTimer !== null) clearTimeout(slot.seekedTimer);
    slot.seekedTimer = null;
    if (slotId === this.visible) {
      const pending = this.pendingShow;
      this.pendingShow = null;
      this.emitShown(slotId, 'seek', pending ? pending.tag : null);
    } else if (this.pendingSwap && this.pendingSwap.index === slot.target) {
      this.swap();
    }
  }

  private swap(): void {
    const pending = this.pendingSwap;
    if (!pending) return;
    if (pending.timer !== null) clearTimeout(pending.timer);
    this.pendingSwap = null;
    this.pendingShow = null;
    this.visible = this.hiddenId();
    this.applyVisibility();
    const slotId = this.visible;
    const slot = this.slots[slotId];
    this.confirmed = { index: slot.target, pts: this.times[slot.target] };
    // The swap shows in the next rendering update, the same moment a frame callback reports.
    nextPaint(() => {
      if (!this.disposed && this.visible === slotId && slot.target === pending.index) this.emitShown(slotId, 'swap', pending.tag);
    });
    const prefetch = this.pendingPrefetch;
    this.pendingPrefetch = null;
    if (prefetch !== null) this.prefetch(prefetch);
  }

  private cancelSwap(): void {
    if (this.pendingSwap?.timer != null) clearTimeout(this.pendingSwap.timer);
    this.pendingSwap = null;
    this.pendingPrefetch = null;
  }

  /** The hidden element did not get there in time: seek the visible one after all. */
  private giveUpSwap(): void {
    const pending = this.pendingSwap;
    if (!pending) return;
    pending.timer = null;
    const prefetch = this.pendingPrefetch;
    this.pendingSwap = null;
    this.pendingPrefetch = null;
    this.pendingShow = { tag: pending.tag };
    this.seek(this.visible, pending.index);
    if (prefetch !== null) this.prefetch(prefetch);
  }

  private emitShown(slotId: SlotId, via: 'swap' | 'seek', tag: unknown): void {
    const slot = this.slots[slotId];
    if (!slot.element || slot.target < 0) return;
    const frame = { index: slot.target, pts: this.times[slot.target] };
    this.confirmed = frame;
    this.callbacks.onShown?.({
      ...frame,
      mediaTime: slot.mediaTime ?? frame.pts,
      wrongFramesSeen: slot.wrong,
      via,
      tag,
      element: slot.element,
    });
  }

  /** The visible element on top and shown; the other hidden but still decoding (no re-mount). */
  private applyVisibility(): void {
    this.slots.forEach((slot, id) => {
      const element = slot.element;
      if (!element) return;
      const onScreen = id === this.visible;
      element.style.visibility = onScreen ? 'visible' : 'hidden';
      element.style.zIndex = onScreen ? '1' : '0';
      element.setAttribute('aria-hidden', onScreen ? 'false' : 'true');
      element.dataset.onScreen = onScreen ? 'true' : 'false';
    });
  }
}

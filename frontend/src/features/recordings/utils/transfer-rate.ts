// Upload speed over a sliding window: per-event rates jump about with the browser's buffering,
// while bytes moved over the last few seconds give a steady figure that still follows a real
// change of link speed within a few seconds.

interface Sample {
  at: number;
  loaded: number;
}

/** How far back the speed looks. */
const WINDOW_MS = 3000;
/** No speed is claimed from less than this much time. */
const MIN_SPAN_MS = 400;

export class TransferRate {
  private samples: Sample[] = [];

  constructor(
    private readonly windowMs = WINDOW_MS,
    private readonly minSpanMs = MIN_SPAN_MS,
  ) {}

  /** Records that `loaded` bytes had gone at time `at` (ms, any monotonic clock). */
  add(at: number, loaded: number): void {
    const last = this.samples[this.samples.length - 1];
    if (last && at < last.at) return;
    this.samples.push({ at, loaded });
    // Keep one sample at or before the window's start, so the window is always fully covered.
    while (this.samples.length > 2 && this.samples[1].at <= at - this.windowMs) this.samples.shift();
  }

  /** Bytes per second over the window, or null until there is enough to say. */
  bytesPerSecond(): number | null {
    if (this.samples.length < 2) return null;
    const first = this.samples[0];
    const last = this.samples[this.samples.length - 1];
    const span = last.at - first.at;
    if (span < this.minSpanMs) return null;
    return ((last.loaded - first.loaded) * 1000) / span;
  }
}

/** Seconds until `total` bytes are through at the given speed; null when the speed is unknown. */
export function secondsLeft(loaded: number, total: number, bytesPerSecond: number | null): number | null {
  if (bytesPerSecond === null || !(bytesPerSecond > 0)) return null;
  return Math.max(0, total - loaded) / bytesPerSecond;
}

// Reads ffmpeg's `-progress` output: blocks of key=value lines, each closed by
// "progress=continue" or, last, "progress=end". Pure: the caller feeds stdout chunks in.

export interface FfmpegProgress {
  /** Share of the known duration written so far, 0–100, one decimal, never decreasing. */
  percent: number;
  /** Output time reached (seconds), or null when ffmpeg had none yet. */
  outTimeSec: number | null;
  /** Frames written so far, when reported. */
  frame: number | null;
  /** Encoding speed as a multiple of real time, when reported (e.g. 3.1). */
  speed: number | null;
  /** True on the block ffmpeg marks progress=end. */
  done: boolean;
}

const MICROS_PER_SEC = 1e6;

/** A microsecond count; "N/A" and ffmpeg's INT64_MIN+1 placeholder (negative) mean "not yet". */
function micros(value: string | undefined): number | null {
  if (value === undefined || !/^-?\d+$/.test(value.trim())) return null;
  const n = Number(value.trim());
  return n >= 0 ? n / MICROS_PER_SEC : null;
}

/** "HH:MM:SS.micro"; before the first packet ffmpeg prints a negative clock ("-577014:32:22.775807"). */
function clock(value: string | undefined): number | null {
  const m = value === undefined ? null : /^(\d+):(\d{2}):(\d{2}(?:\.\d+)?)$/.exec(value.trim());
  if (!m) return null;
  return Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]);
}

function plainNumber(value: string | undefined): number | null {
  if (value === undefined) return null;
  const n = Number.parseFloat(value.trim());
  return Number.isFinite(n) ? n : null;
}

/**
 * Output time of one block. out_time_us is preferred; out_time_ms holds microseconds too (a
 * long-standing ffmpeg naming bug, kept for compatibility), so it is read as microseconds;
 * out_time is the last resort.
 */
export function blockOutTime(block: ReadonlyMap<string, string>): number | null {
  return micros(block.get('out_time_us')) ?? micros(block.get('out_time_ms')) ?? clock(block.get('out_time'));
}

export function progressPercent(outTimeSec: number, durationSec: number): number {
  const raw = (outTimeSec / durationSec) * 100;
  return Math.min(100, Math.max(0, Math.round(raw * 10) / 10));
}

/** Incremental parser; chunks may split lines anywhere. */
export class FfmpegProgressParser {
  private pending = '';
  private block = new Map<string, string>();
  private lastPercent = 0;

  constructor(private readonly durationSec: number) {
    if (typeof durationSec !== 'number' || !Number.isFinite(durationSec) || durationSec <= 0) {
      throw new RangeError('progress needs the input duration in seconds (> 0)');
    }
  }

  /** Feeds output text; returns one update for each block completed by this chunk. */
  push(chunk: string | Uint8Array): FfmpegProgress[] {
    this.pending += typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8');
    const updates: FfmpegProgress[] = [];
    let newline: number;
    while ((newline = this.pending.indexOf('\n')) >= 0) {
      const line = this.pending.slice(0, newline).replace(/\r$/, '');
      this.pending = this.pending.slice(newline + 1);
      const eq = line.indexOf('=');
      if (eq <= 0) continue;
      const key = line.slice(0, eq).trim();
      const value = line.slice(eq + 1).trim();
      if (key === 'progress') {
        updates.push(this.finishBlock(value === 'end'));
      } else {
        this.block.set(key, value);
      }
    }
    return updates;
  }

  private finishBlock(done: boolean): FfmpegProgress {
    const outTimeSec = blockOutTime(this.block);
    if (done) this.lastPercent = 100;
    else if (outTimeSec !== null) this.lastPercent = Math.max(this.lastPercent, progressPercent(outTimeSec, this.durationSec));
    const frame = plainNumber(this.block.get('frame'));
    const speed = plainNumber(this.block.get('speed'));
    this.block = new Map();
    return { percent: this.lastPercent, outTimeSec, frame, speed, done };
  }
}

/** All updates of a complete -progress text (tests, logs). */
export function parseProgressText(text: string, durationSec: number): FfmpegProgress[] {
  return new FfmpegProgressParser(durationSec).push(text.endsWith('\n') ? text : `${text}\n`);
}

// Test times as people read and type them: "mm:ss.SSS", "h:mm:ss.SSS" past an hour.

const pad = (n: number, width: number): string => String(n).padStart(width, '0');

/**
 * "mm:ss.SSS" below an hour, "h:mm:ss.SSS" from an hour on, a leading "-" for negative times.
 * Rounded to the millisecond; a value that rounds to zero has no sign.
 */
export function formatTestTime(seconds: number): string {
  if (typeof seconds !== 'number' || !Number.isFinite(seconds)) {
    throw new RangeError(`time must be a finite number of seconds, got ${String(seconds)}`);
  }
  const totalMs = Math.round(Math.abs(seconds) * 1000);
  const sign = seconds < 0 && totalMs > 0 ? '-' : '';
  const ms = totalMs % 1000;
  const totalSec = (totalMs - ms) / 1000;
  const s = totalSec % 60;
  const totalMin = (totalSec - s) / 60;
  const m = totalMin % 60;
  const h = (totalMin - m) / 60;
  const tail = `${pad(s, 2)}.${pad(ms, 3)}`;
  return h > 0 ? `${sign}${h}:${pad(m, 2)}:${tail}` : `${sign}${pad(totalMin, 2)}:${tail}`;
}

// Seconds alone may have any number of digits; after a colon, fields are exactly two digits.
const SECONDS_ONLY = /^(\d+)(?:\.(\d{1,6}))?$/;
const MIN_SEC = /^(\d+):(\d{2})(?:\.(\d{1,6}))?$/;
const HOUR_MIN_SEC = /^(\d+):(\d{2}):(\d{2})(?:\.(\d{1,6}))?$/;

function fractionMicros(digits: string | undefined): number {
  return digits ? Number(digits.padEnd(6, '0')) : 0;
}

/**
 * Strict parser for "ss", "ss.sss", "mm:ss(.sss)" and "h:mm:ss(.sss)", with an optional leading
 * "-". Up to six decimals; minutes and seconds after a colon are two digits below 60. Returns
 * seconds, computed through whole microseconds so "1:00:00.1" is exactly 3600.1.
 */
export function parseTimecode(text: string): number {
  if (typeof text !== 'string') throw new RangeError('time must be text such as 12.5, 01:30.000 or 1:02:03.5');
  const trimmed = text.trim();
  if (trimmed === '') throw new RangeError('time is empty; type seconds (12.5), mm:ss.sss or h:mm:ss.sss');
  const negative = trimmed.startsWith('-');
  const body = negative ? trimmed.slice(1) : trimmed;
  if (body.includes(',')) {
    throw new RangeError(`"${text}" is not a time: use "." for fractions of a second, not ","`);
  }
  let h = 0;
  let m = 0;
  let s = 0;
  let frac: string | undefined;
  let match: RegExpExecArray | null;
  if ((match = SECONDS_ONLY.exec(body))) {
    s = Number(match[1]);
    frac = match[2];
  } else if ((match = MIN_SEC.exec(body))) {
    m = Number(match[1]);
    s = Number(match[2]);
    frac = match[3];
  } else if ((match = HOUR_MIN_SEC.exec(body))) {
    h = Number(match[1]);
    m = Number(match[2]);
    s = Number(match[3]);
    frac = match[4];
    if (m >= 60) throw new RangeError(`"${text}" is not a time: minutes must be below 60`);
  } else {
    throw new RangeError(
      `"${text}" is not a time: expected seconds (12.5), mm:ss.sss (01:30.250) or h:mm:ss.sss (1:02:03.5), at most six decimals`,
    );
  }
  if (body.includes(':') && s >= 60) throw new RangeError(`"${text}" is not a time: seconds must be below 60`);
  const micros = ((h * 60 + m) * 60 + s) * 1e6 + fractionMicros(frac);
  if (!Number.isSafeInteger(micros)) throw new RangeError(`"${text}" is too long a time`);
  const seconds = micros / 1e6;
  return negative && seconds !== 0 ? -seconds : seconds;
}

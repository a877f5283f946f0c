const UNITS = ['bytes', 'KB', 'MB', 'GB', 'TB'] as const;

/**
 * A size for people, in powers of 1024 as file managers show them: 8589934592 → "8 GB",
 * 1536 → "1.5 KB". At most one decimal, dropped when it is zero.
 */
export function formatByteSize(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) throw new RangeError('a size is a number of bytes ≥ 0');
  let value = bytes;
  let unit = 0;
  while (value >= 1024 && unit < UNITS.length - 1) {
    value /= 1024;
    unit += 1;
  }
  if (unit === 0) return `${bytes} ${bytes === 1 ? 'byte' : 'bytes'}`;
  const rounded = Math.round(value * 10) / 10;
  return `${Number.isInteger(rounded) ? rounded.toFixed(0) : rounded.toFixed(1)} ${UNITS[unit]}`;
}

export function tooLargeMessage(limitBytes: number): string {
  return `The file is larger than the limit of ${formatByteSize(limitBytes)}`;
}

// Sizes, rates and durations as people read them. Decimal units (1 MB = 1 000 000 bytes), the
// way disks and network speeds are labelled.

const BYTE_UNITS = ['bytes', 'kB', 'MB', 'GB', 'TB'] as const;

export function formatBytes(bytes: number): string {
  if (!Number.isFinite(bytes) || bytes < 0) return '–';
  if (bytes < 1000) return `${Math.round(bytes)} bytes`;
  let value = bytes;
  let unit = 0;
  while (value >= 1000 && unit < BYTE_UNITS.length - 1) {
    value /= 1000;
    unit += 1;
  }
  return `${value.toFixed(value < 10 ? 2 : value < 100 ? 1 : 0)} ${BYTE_UNITS[unit]}`;
}

/** Transfer speed in MB/s with one decimal (two below 1 MB/s, so a slow link does not read 0.0). */
export function formatRate(bytesPerSecond: number): string {
  const mb = bytesPerSecond / 1e6;
  return `${mb.toFixed(mb < 1 ? 2 : 1)} MB/s`;
}

/** A wait such as "45 s", "3 min 05 s" or "1 h 02 min"; rounds up so it never promises too little. */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0) return '–';
  const total = Math.ceil(seconds);
  if (total < 60) return `${total} s`;
  const minutes = Math.floor(total / 60);
  if (minutes < 60) return `${minutes} min ${String(total % 60).padStart(2, '0')} s`;
  return `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, '0')} min`;
}

/** A frame rate to three significant decimals at most: 30, 29.97, 59.94, 23.976. */
export function formatFps(fps: number): string {
  if (!Number.isFinite(fps)) return '–';
  return `${Number(fps.toFixed(3))} fps`;
}

import type { ChannelAccuracy } from '@dialsheet/common';

/** The numeric part of a channel that must hang together, whichever request set each field. */
export interface ChannelNumbers {
  resolution: number;
  rangeMin: number;
  rangeMax: number;
  fullScale: number | null;
  operatingMin: number | null;
  operatingMax: number | null;
  accuracy: ChannelAccuracy | null;
  plausibleMin: number | null;
  plausibleMax: number | null;
}

const isSet = (v: number | null | undefined): v is number => typeof v === 'number';

/**
 * Every rule a channel breaks, as messages naming the fields, in a fixed order; [] when it is
 * sound. Checked on the merged result of a change, so a PATCH of one bound is judged against the
 * stored other bound.
 */
export function channelProblems(c: ChannelNumbers): string[] {
  const problems: string[] = [];
  if (!(c.resolution > 0)) problems.push(`resolution must be greater than 0, got ${c.resolution}`);
  if (!(c.rangeMin < c.rangeMax)) problems.push(`rangeMin (${c.rangeMin}) must be less than rangeMax (${c.rangeMax})`);
  if (isSet(c.fullScale) && !(c.fullScale > 0)) problems.push(`fullScale must be greater than 0, got ${c.fullScale}`);
  if (isSet(c.operatingMin) && isSet(c.operatingMax) && !(c.operatingMin < c.operatingMax)) {
    problems.push(`operatingMin (${c.operatingMin}) must be less than operatingMax (${c.operatingMax})`);
  }
  if (isSet(c.plausibleMin) && isSet(c.plausibleMax) && !(c.plausibleMin < c.plausibleMax)) {
    problems.push(`plausibleMin (${c.plausibleMin}) must be less than plausibleMax (${c.plausibleMax})`);
  }
  for (const key of ['percentOfFullScale', 'percentOfReading', 'digits'] as const) {
    const value = c.accuracy?.[key];
    if (isSet(value) && value < 0) problems.push(`accuracy.${key} must not be negative, got ${value}`);
  }
  return problems;
}

/** Regions may touch the frame's edge; this absorbs float sums such as 0.7 + 0.3. */
const EDGE_TOLERANCE = 1e-9;

export interface RegionBox {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** Problems with one region (fractions of the frame), prefixed with `label`, e.g. "regions.2". */
export function regionProblems(r: RegionBox, label: string): string[] {
  const problems: string[] = [];
  for (const key of ['x', 'y'] as const) {
    if (!(r[key] >= 0 && r[key] <= 1)) problems.push(`${label}.${key} must be a fraction of the frame between 0 and 1, got ${r[key]}`);
  }
  for (const key of ['width', 'height'] as const) {
    if (!(r[key] > 0 && r[key] <= 1)) problems.push(`${label}.${key} must be a fraction of the frame above 0 and at most 1, got ${r[key]}`);
  }
  if (r.x + r.width > 1 + EDGE_TOLERANCE) problems.push(`${label}: x + width must not exceed 1 (the right edge of the frame)`);
  if (r.y + r.height > 1 + EDGE_TOLERANCE) problems.push(`${label}: y + height must not exceed 1 (the bottom edge of the frame)`);
  return problems;
}

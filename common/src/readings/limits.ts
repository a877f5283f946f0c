// Limit checks on a parsed value. A reading outside the plausible range or the instrument's
// operating limits is flagged for a second look and kept as typed: displays do show odd values
// (a sensor unplugged, a transient), and refusing them would push readers to type something else.

import type { ChannelLimits, LimitWarning } from '../types/reading';

const isSet = (limit: number | null | undefined): limit is number =>
  typeof limit === 'number' && Number.isFinite(limit);

/**
 * Warnings for one value against one channel's limits, in a fixed order (plausible, then
 * operating). Limits are inclusive: a value equal to a limit is within it. Absent limits are skipped.
 */
export function checkLimits(value: number, channel: ChannelLimits): LimitWarning[] {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`value must be a finite number, got ${String(value)}`);
  }
  const warnings: LimitWarning[] = [];
  const { plausibleMin, plausibleMax, operatingMin, operatingMax } = channel;
  if (isSet(plausibleMin) && value < plausibleMin) {
    warnings.push({
      code: 'below-plausible',
      message: `${value} is below the plausible minimum of ${plausibleMin}; check the frame`,
    });
  }
  if (isSet(plausibleMax) && value > plausibleMax) {
    warnings.push({
      code: 'above-plausible',
      message: `${value} is above the plausible maximum of ${plausibleMax}; check the frame`,
    });
  }
  const belowOperating = isSet(operatingMin) && value < operatingMin;
  const aboveOperating = isSet(operatingMax) && value > operatingMax;
  if (belowOperating || aboveOperating) {
    const range =
      isSet(operatingMin) && isSet(operatingMax)
        ? `${operatingMin} to ${operatingMax}`
        : isSet(operatingMin)
          ? `at least ${operatingMin}`
          : `at most ${operatingMax}`;
    warnings.push({
      code: 'outside-operating',
      message: `${value} is outside the instrument's operating limits (${range}); the reading may not be valid`,
    });
  }
  return warnings;
}

import type { Channel, ChannelAccuracy } from '@dialsheet/common';

const isSet = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/**
 * A number as the user typed it into the form: no rounding, no grouping, a true minus sign so
 * negative limits stand out in a dense table.
 */
export function formatValue(value: number): string {
  return String(value).replace(/^-/, '−');
}

/** "−50 … 200" for a pair, "≥ 5" or "≤ 90" for one bound, null for none. */
export function formatBounds(min: number | null, max: number | null): string | null {
  if (isSet(min) && isSet(max)) return `${formatValue(min)} … ${formatValue(max)}`;
  if (isSet(min)) return `≥ ${formatValue(min)}`;
  if (isSet(max)) return `≤ ${formatValue(max)}`;
  return null;
}

/**
 * The accuracy spec in the data sheet's own terms, one part a line:
 * ["±0.5 % FS", "±0.2 % rdg + 2 digits"]. Empty when the spec has no parts.
 */
export function formatAccuracy(accuracy: ChannelAccuracy | null): string[] {
  if (!accuracy) return [];
  const parts: string[] = [];
  if (isSet(accuracy.percentOfFullScale)) parts.push(`±${formatValue(accuracy.percentOfFullScale)} % FS`);
  const rdg = isSet(accuracy.percentOfReading) ? `±${formatValue(accuracy.percentOfReading)} % rdg` : null;
  const digits = isSet(accuracy.digits) ? `${formatValue(accuracy.digits)} ${accuracy.digits === 1 ? 'digit' : 'digits'}` : null;
  if (rdg && digits) parts.push(`${rdg} + ${digits}`);
  else if (rdg) parts.push(rdg);
  else if (digits) parts.push(`±${digits}`);
  return parts;
}

/** The label a region carries on the frame: symbol, with the name for context. */
export function channelLabel(channel: Pick<Channel, 'symbol' | 'name'>): string {
  return `${channel.symbol} · ${channel.name}`;
}

import { formatTestTime, type CampaignMember, type Channel, type ReadingFlag } from '@dialsheet/common';

// How sheet figures read on screen: times as mm:ss.SSS, intervals and rates with their units.

/** Seconds of test or video time as "mm:ss.SSS" (h:mm:ss.SSS past an hour); "–" for none. */
export function formatTime(seconds: number | null | undefined): string {
  return typeof seconds === 'number' && Number.isFinite(seconds) ? formatTestTime(seconds) : '–';
}

/** An interval such as "2 s" or "0.5 s", without trailing zeros. */
export function formatInterval(seconds: number): string {
  return `${Number(seconds.toFixed(6))} s`;
}

/** A rate as a percentage with one decimal, "–" while nothing has been compared. */
export function formatPercent(rate: number | null): string {
  return rate === null ? '–' : `${(rate * 100).toFixed(1)} %`;
}

/** Whole numbers with thousands grouped by a narrow space ("10 000"), the way the tables show counts. */
export function formatCount(n: number): string {
  // Plain string work: the first Intl call of a page costs tens of milliseconds, and the sheet
  // table's first render is timed.
  const sign = n < 0 ? '-' : '';
  return sign + String(Math.abs(Math.round(n))).replace(/\B(?=(\d{3})+(?!\d))/g, '\u202f');
}

export const FLAG_LABELS: Record<ReadingFlag, string> = {
  blank: 'blank',
  unreadable: 'unreadable',
  ambiguous: 'ambiguous',
};

/** A member's name for a user id; a person who has left the campaign still shows as "former member". */
export function memberName(members: readonly CampaignMember[], userId: string | null | undefined): string | null {
  if (!userId) return null;
  return members.find((m) => m.userId === userId)?.name ?? 'former member';
}

/** The sheet's channels, in its entry order, from the campaign's list. Missing ids are skipped. */
export function sheetChannels(channelIds: readonly string[], channels: readonly Channel[]): Channel[] {
  const byId = new Map(channels.map((c) => [c.id, c]));
  return channelIds.flatMap((id) => {
    const channel = byId.get(id);
    return channel ? [channel] : [];
  });
}

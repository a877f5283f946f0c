import { describe, expect, it } from 'vitest';
import { mediaUrlsRefreshDelay } from './get-media-urls';

describe('mediaUrlsRefreshDelay', () => {
  const now = Date.parse('2026-03-02T09:00:00.000Z');

  it('replaces 15-minute links a minute before they expire', () => {
    expect(mediaUrlsRefreshDelay('2026-03-02T09:15:00.000Z', now)).toBe(14 * 60_000);
  });

  it('replaces short-lived links at half their life, but not more often than every 5 s', () => {
    expect(mediaUrlsRefreshDelay('2026-03-02T09:01:00.000Z', now)).toBe(30_000);
    expect(mediaUrlsRefreshDelay('2026-03-02T09:00:04.000Z', now)).toBe(5_000);
    expect(mediaUrlsRefreshDelay('2026-03-02T08:59:00.000Z', now)).toBe(5_000);
    expect(mediaUrlsRefreshDelay('not a date', now)).toBe(5_000);
  });

  it('renews long-lived links within six hours, inside what a timer can wait', () => {
    expect(mediaUrlsRefreshDelay('2099-12-31T23:59:59.000Z', now)).toBe(6 * 3600_000);
  });
});

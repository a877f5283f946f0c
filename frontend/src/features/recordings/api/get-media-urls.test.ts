import { describe, expect, it } from 'vitest';
import type { MediaUrls } from '@dialsheet/common';
import { mediaUrlsRefreshDelay, onLocalClock } from './get-media-urls';

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

describe('onLocalClock', () => {
  const fromServer: MediaUrls = {
    proxyUrl: '/api/media/r/proxy?exp=1772442900&sig=s',
    originalUrl: '/api/media/r/original?exp=1772442900&sig=s',
    posterUrl: null,
    issuedAt: '2026-03-02T09:00:00.000Z',
    expiresAt: '2026-03-02T09:15:00.000Z',
  };
  const DAY = 24 * 3600_000;

  it('keeps the links and their 15-minute life, counted from arrival on a browser a day ahead or behind', () => {
    for (const skew of [DAY, -DAY, 0]) {
      const arrived = Date.parse('2026-03-02T09:00:00.200Z') + skew;
      const local = onLocalClock(fromServer, arrived);
      expect(local.proxyUrl).toBe(fromServer.proxyUrl);
      expect(local.originalUrl).toBe(fromServer.originalUrl);
      expect(Date.parse(local.expiresAt) - arrived).toBe(15 * 60_000);
      expect(Date.parse(local.issuedAt)).toBe(arrived);
      // So the renewal comes a minute before the end, as on a browser with the right time.
      expect(mediaUrlsRefreshDelay(local.expiresAt, arrived)).toBe(14 * 60_000);
    }
  });

  it("without the server's signing time, leaves the answer as it came", () => {
    const older = { ...fromServer, issuedAt: undefined } as unknown as MediaUrls;
    expect(onLocalClock(older, 0)).toBe(older);
  });
});

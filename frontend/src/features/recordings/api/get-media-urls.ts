import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MediaUrls } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

/** Fetch new links this long before the old ones stop working. */
const REFRESH_MARGIN_MS = 60_000;
/** Never ask more often than this, even for very short-lived links. */
const MIN_REFRESH_MS = 5_000;
/** Timers cannot wait longer than about 24.8 days; long-lived links are renewed sooner anyway. */
const MAX_REFRESH_MS = 6 * 3600_000;

/**
 * The links with their times moved onto this browser's clock. The server's times are on its own
 * clock: a browser a day ahead took fresh links for long dead and asked for new ones every few
 * seconds (the video reloading each time); one a day behind kept dead links for hours. The
 * lifetime (expiresAt − issuedAt) is the same on both clocks, so it is counted from arrival here.
 * Everything that compares expiresAt with Date.now() is then right, whatever the clock says.
 */
export function onLocalClock(urls: MediaUrls, receivedAt = Date.now()): MediaUrls {
  const lifetime = Date.parse(urls.expiresAt) - Date.parse(urls.issuedAt);
  if (!Number.isFinite(lifetime)) return urls;
  return { ...urls, issuedAt: new Date(receivedAt).toISOString(), expiresAt: new Date(receivedAt + lifetime).toISOString() };
}

export const getMediaUrls = async (recordingId: string): Promise<MediaUrls> =>
  onLocalClock(await api.post<MediaUrls>(`/recordings/${recordingId}/media-urls`, undefined, { notify: false }));

/** Milliseconds until links that expire at `expiresAt` should be replaced. */
export function mediaUrlsRefreshDelay(expiresAt: string, now = Date.now()): number {
  const expires = Date.parse(expiresAt);
  if (!Number.isFinite(expires)) return MIN_REFRESH_MS;
  const lifetime = expires - now;
  // Short links refresh at half their life rather than after they have died.
  const margin = Math.min(REFRESH_MARGIN_MS, lifetime / 2);
  return Math.min(MAX_REFRESH_MS, Math.max(MIN_REFRESH_MS, lifetime - margin));
}

export const getMediaUrlsQueryOptions = (recordingId: string) =>
  queryOptions({
    queryKey: ['recordings', recordingId, 'media-urls'],
    queryFn: () => getMediaUrls(recordingId),
    // Signed links stay valid until expiresAt: reuse them until shortly before, then fetch new ones.
    staleTime: (query) => (query.state.data ? mediaUrlsRefreshDelay(query.state.data.expiresAt) : 0),
    refetchInterval: (query) => (query.state.data ? mediaUrlsRefreshDelay(query.state.data.expiresAt) : false),
    refetchIntervalInBackground: true,
  });

export function useMediaUrls({
  recordingId,
  queryConfig,
}: {
  recordingId: string;
  queryConfig?: QueryConfig<typeof getMediaUrlsQueryOptions>;
}) {
  return useQuery({ ...getMediaUrlsQueryOptions(recordingId), ...queryConfig });
}

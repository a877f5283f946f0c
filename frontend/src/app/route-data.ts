import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { authToken, getUserQueryOptions } from '@/lib/auth';
import { getCampaignQueryOptions } from '@/features/campaigns/api/get-campaign';
import { getChannelsQueryOptions } from '@/features/channels/api/get-channels';
import { getMembersQueryOptions } from '@/features/members/api/get-members';
import { getSheetQueryOptions } from '@/features/sheets/api/get-sheet';
import { prefetchSheetGrid } from '@/features/sheets/api/get-sheet-grid';

// Route loaders that only START the requests a page will make, into the query cache its hooks
// read (the router-and-query-cache pattern: the loader warms the cache, the component owns the
// data). The router calls a route's loader as soon as the URL matches, alongside fetching the
// route's code, so the requests no longer wait for the code, nor for each other (the page's
// hooks would ask for the user, then the campaign, then the sheet, one after the other). They
// resolve at once: nothing waits on them, and a failure is left for the page's own query to show.
// Data already in the cache is not asked for again (ensureQueryData), so revalidating a loader
// after a search-parameter change costs nothing.

type Loader = (args: LoaderFunctionArgs) => null;

/** Lets requests run with nobody waiting on them; their outcome stays in the query cache. */
function warm(...pending: Array<Promise<unknown>>): void {
  for (const request of pending) request.catch(() => undefined);
}

/** Every signed-in page: the person signed in (the route guard waits for it). */
export function signedInLoader(queryClient: QueryClient): Loader {
  return () => {
    if (authToken.get()) warm(queryClient.ensureQueryData(getUserQueryOptions()));
    return null;
  };
}

/** Every page of a campaign: the campaign (the layout waits for it). */
export function campaignLoader(queryClient: QueryClient): Loader {
  return ({ params }) => {
    if (authToken.get() && params.campaignId) warm(queryClient.ensureQueryData(getCampaignQueryOptions(params.campaignId)));
    return null;
  };
}

/**
 * The sheet page: the sheet, the campaign's channels and members, and (when it opens on the
 * table, the default tab) the table's grid, the largest answer.
 */
export function sheetLoader(queryClient: QueryClient): Loader {
  return ({ params, request }) => {
    const { campaignId, sheetId } = params;
    if (!authToken.get() || !campaignId || !sheetId) return null;
    warm(
      queryClient.ensureQueryData(getSheetQueryOptions(sheetId)),
      queryClient.ensureQueryData(getChannelsQueryOptions(campaignId)),
      queryClient.ensureQueryData(getMembersQueryOptions(campaignId)),
    );
    if (!new URL(request.url).searchParams.has('tab')) prefetchSheetGrid(sheetId);
    return null;
  };
}

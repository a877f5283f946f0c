import type { QueryClient } from '@tanstack/react-query';

/**
 * A release changes more than its own row: signing locks runs (dashboard, run and sheet pages show
 * the lock) and a correction lifts one. Everything that shows a lock is refreshed.
 */
export async function refreshAfterReleaseChange(queryClient: QueryClient, campaignId: string): Promise<void> {
  await Promise.all([
    queryClient.invalidateQueries({ queryKey: ['releases'] }),
    queryClient.invalidateQueries({ queryKey: ['runs'] }),
    queryClient.invalidateQueries({ queryKey: ['sheets'] }),
    queryClient.invalidateQueries({ queryKey: ['campaigns', campaignId] }),
  ]);
}

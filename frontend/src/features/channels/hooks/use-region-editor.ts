import { useCallback, useMemo, useState } from 'react';
import type { Channel, DisplayRegionInput } from '@dialsheet/common';
import { useDisplayRegions } from '../api/get-display-regions';
import { useSetDisplayRegions } from '../api/set-display-regions';
import type { Rect } from '../utils/region-geometry';

/**
 * The run's display regions while someone draws them: a local draft over the saved set, sent
 * whole with one PUT. Shared by the overlay on the player and the card beside it.
 */
export function useRegionEditor({ runId, channels }: { runId: string; channels: Channel[] }) {
  // Without channels there is nothing a region could belong to.
  const saved = useDisplayRegions({ runId, queryConfig: { enabled: channels.length > 0 } });
  const [draft, setDraft] = useState<DisplayRegionInput[] | null>(null);
  const save = useSetDisplayRegions({ mutationConfig: { onSuccess: () => setDraft(null) } });
  const [activeChannelId, setActiveChannelId] = useState<string | null>(null);

  const regions = useMemo<DisplayRegionInput[]>(() => {
    const known = new Set(channels.map((c) => c.id));
    const list = draft ?? (saved.data ?? []).map(({ channelId, x, y, width, height }) => ({ channelId, x, y, width, height }));
    return list.filter((r) => known.has(r.channelId));
  }, [channels, draft, saved.data]);

  const setRegion = useCallback(
    (channelId: string, rect: Rect) => {
      const next = [...regions.filter((r) => r.channelId !== channelId), { channelId, ...rect }];
      setDraft(next);
      save.reset();
      // Step on to the next channel still without a region, so a whole panel is drawn in a row.
      const has = new Set(next.map((r) => r.channelId));
      const from = channels.findIndex((c) => c.id === channelId);
      const following = [...channels.slice(from + 1), ...channels.slice(0, from)].find((c) => !has.has(c.id));
      setActiveChannelId(following?.id ?? null);
    },
    [channels, regions, save],
  );

  const removeRegion = useCallback(
    (channelId: string) => {
      setDraft(regions.filter((r) => r.channelId !== channelId));
      save.reset();
    },
    [regions, save],
  );

  const submit = useCallback(
    (reason?: string) => {
      const why = reason?.trim();
      save.mutate({ runId, data: why ? { regions, reason: why } : { regions } });
    },
    [regions, runId, save],
  );

  const discard = useCallback(() => {
    setDraft(null);
    setActiveChannelId(null);
    save.reset();
  }, [save]);

  return {
    saved,
    regions,
    dirty: draft !== null,
    activeChannelId,
    setActiveChannelId,
    setRegion,
    removeRegion,
    submit,
    discard,
    saving: save.isPending,
    saveError: save.isError ? save.error : null,
  };
}

export type RegionEditor = ReturnType<typeof useRegionEditor>;

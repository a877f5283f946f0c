import { queryOptions, useQuery } from '@tanstack/react-query';
import { layOutSheetGrid, type SheetGrid, type SheetGridWire } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import type { QueryConfig } from '@/lib/query-client';

// The sheet table's data in one compact answer (rows, channels, the passes the viewer may see,
// resolutions). The server applies the blind rules itself; the key says which passes the viewer
// may see now, so finishing pass 2 (which opens pass 1 to the checker) asks again. The key sits
// under the readings' key, so whatever refreshes a sheet's readings refreshes the table too.

/** What the viewer may see, as the page reckons it from the sheet (part of the key). */
export interface SheetGridView {
  see1: boolean;
  see2: boolean;
  withResolutions: boolean;
}

/** The server sends each pass's entries as the database wrote them; they are put cell by cell here. */
export const getSheetGrid = (sheetId: string): Promise<SheetGrid> =>
  api.get<SheetGridWire>(`/sheets/${sheetId}/grid`, { notify: false }).then(layOutSheetGrid);

/** Requests started before the page knew what the viewer may see, by sheet id. */
interface EarlyGrid {
  promise: Promise<SheetGrid>;
  expires: number;
  /** Set once the answer is in: the table starts from it without another round of rendering. */
  settled?: { grid: SheetGrid; at: number };
}
const early = new Map<string, EarlyGrid>();
const EARLY_TTL_MS = 10_000;

/**
 * Starts the grid request as soon as the page has the sheet's id, alongside the page's other
 * requests (the table's own query needs the sheet, the viewer's roles and the channels first,
 * and the grid is the largest answer). The server applies the blind rules, so the answer is the
 * same whatever the page later reckons; the table's first fetch takes the request over, or, when
 * the answer is already in, the table's query starts from it.
 */
export function prefetchSheetGrid(sheetId: string, now = Date.now()): void {
  const pending = early.get(sheetId);
  if (pending && pending.expires > now) return;
  const promise = getSheetGrid(sheetId);
  const entry: EarlyGrid = { promise, expires: now + EARLY_TTL_MS };
  promise.then(
    (grid) => {
      entry.settled = { grid, at: Date.now() };
    },
    // A refusal is the table query's to report, if it ever asks; nothing else waits on this one.
    () => undefined,
  );
  early.set(sheetId, entry);
}

function takeEarly(sheetId: string): Promise<SheetGrid> | null {
  const pending = early.get(sheetId);
  early.delete(sheetId);
  return pending && pending.expires > Date.now() ? pending.promise : null;
}

/** The early answer if it is already in (and still young), handed over once. */
function takeSettled(sheetId: string): { grid: SheetGrid; at: number } | undefined {
  const pending = early.get(sheetId);
  if (!pending?.settled || pending.expires <= Date.now()) return undefined;
  early.delete(sheetId);
  return pending.settled;
}

/**
 * The query library reads `initialData` and then, in the same call, `initialDataUpdatedAt`: the
 * arrival time of the answer just handed over waits here for that second read.
 */
let handedOverAt: number | undefined;

function initialGrid(sheetId: string): SheetGrid | undefined {
  const taken = takeSettled(sheetId);
  handedOverAt = taken?.at;
  return taken?.grid;
}

function initialGridAt(): number | undefined {
  const at = handedOverAt;
  handedOverAt = undefined;
  return at;
}

/** Every cached grid of a sheet, whatever the view: cache updates after a save go to all of them. */
export const sheetGridKey = (sheetId: string) => ['sheets', 'readings', sheetId, 'grid'] as const;

export const getSheetGridQueryOptions = (sheetId: string, view: SheetGridView) =>
  queryOptions({
    queryKey: [...sheetGridKey(sheetId), view.see1, view.see2, view.withResolutions] as const,
    queryFn: () => takeEarly(sheetId) ?? getSheetGrid(sheetId),
    // Read when the query is first made (a query already in the cache ignores it): an early
    // answer already in fills it at once, as fresh as when it arrived.
    initialData: () => initialGrid(sheetId),
    initialDataUpdatedAt: initialGridAt,
    retry: false,
    // A fresh answer replaces the arrays wholesale; comparing hundreds of thousands of elements
    // with the cached ones to keep equal parts would cost more than it saves.
    structuralSharing: false,
  });

export function useSheetGrid({
  sheetId,
  view,
  queryConfig,
}: {
  sheetId: string;
  view: SheetGridView;
  queryConfig?: QueryConfig<typeof getSheetGridQueryOptions>;
}) {
  return useQuery({ ...getSheetGridQueryOptions(sheetId, view), ...queryConfig });
}

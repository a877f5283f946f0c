import { useMemo } from 'react';
import type { Channel, Sheet } from '@dialsheet/common';
import { useMismatches } from '../api/get-mismatches';
import { useReadings } from '../api/get-readings';
import { useSheetRows } from '../api/get-sheet-rows';
import { mayReadPass, type SheetViewer } from '../utils/sheet-access';
import { attachResolutions, buildSheetGrid } from '../utils/sheet-grid';

/**
 * The sheet table's data: rows, the passes the viewer may see (the others are never asked for),
 * and the resolutions when the viewer may read the mismatch list.
 */
export function useSheetGridData({
  sheet,
  channels,
  viewer,
  decimalComma,
  withResolutions,
}: {
  sheet: Sheet;
  channels: Channel[];
  viewer: SheetViewer;
  decimalComma: boolean;
  withResolutions: boolean;
}) {
  const see1 = mayReadPass(sheet, viewer, 1);
  const see2 = mayReadPass(sheet, viewer, 2);
  const rows = useSheetRows({ sheetId: sheet.id });
  const pass1 = useReadings({ sheetId: sheet.id, pass: 1, queryConfig: { enabled: see1 } });
  const pass2 = useReadings({ sheetId: sheet.id, pass: 2, queryConfig: { enabled: see2 } });
  const ready = rows.isSuccess && (!see1 || pass1.isSuccess) && (!see2 || pass2.isSuccess);
  // Resolutions only colour cells already drawn: ask for them once the entries are in, so their
  // comparison on the server does not hold up the entries themselves.
  const mismatches = useMismatches({ sheetId: sheet.id, queryConfig: { enabled: withResolutions && ready } });

  const channelIds = useMemo(() => channels.map((c) => c.id), [channels]);
  const entries = useMemo(
    () =>
      buildSheetGrid({
        rows: rows.data ?? [],
        channelIds,
        pass1: see1 ? (pass1.data ?? []) : null,
        pass2: see2 ? (pass2.data ?? []) : null,
        mismatches: null,
        parseOptions: { decimalComma },
      }),
    [channelIds, decimalComma, pass1.data, pass2.data, rows.data, see1, see2],
  );
  // A newer mismatch list (after a resolution) changes only the resolutions, not the entries.
  const grid = useMemo(
    () => attachResolutions(entries, withResolutions ? mismatches.data?.cells : null),
    [entries, mismatches.data, withResolutions],
  );

  const error = rows.error ?? pass1.error ?? pass2.error;
  const retry = () => {
    void rows.refetch();
    if (see1) void pass1.refetch();
    if (see2) void pass2.refetch();
  };
  return { grid, ready, error, retry, see1, see2 };
}

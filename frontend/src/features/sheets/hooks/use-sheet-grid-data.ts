import { useMemo } from 'react';
import type { Channel, Sheet } from '@dialsheet/common';
import { useSheetGrid } from '../api/get-sheet-grid';
import { useSheetRows } from '../api/get-sheet-rows';
import { mayReadPass, type SheetViewer } from '../utils/sheet-access';
import { buildTableGrid } from '../utils/sheet-grid';

/**
 * The sheet table's data: one compact answer with the rows, the passes the viewer may see and the
 * resolutions when they may read the mismatch list. A viewer who may see neither pass gets only
 * the rows (the grid would be refused).
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
  const seeAny = see1 || see2;
  const data = useSheetGrid({ sheetId: sheet.id, view: { see1, see2, withResolutions }, queryConfig: { enabled: seeAny } });
  const rows = useSheetRows({ sheetId: sheet.id, queryConfig: { enabled: !seeAny } });
  const ready = seeAny ? data.isSuccess : rows.isSuccess;

  const channelIds = useMemo(() => channels.map((c) => c.id), [channels]);
  const grid = useMemo(
    () => buildTableGrid({ grid: seeAny ? data.data : null, channelIds, rows: rows.data, parseOptions: { decimalComma } }),
    [channelIds, data.data, decimalComma, rows.data, seeAny],
  );

  const error = seeAny ? data.error : rows.error;
  const retry = () => void (seeAny ? data.refetch() : rows.refetch());
  return { grid, ready, error, retry, see1, see2 };
}

import { useCallback, useState } from 'react';
import type { Reading } from '@dialsheet/common';
import { buildStoredReadings } from '../components/entry/entry-rows';

/**
 * The person's own stored entries on the entry screen: loaded once from the server, then kept up
 * to date from each acknowledged save (so a later change of the same cell names the right
 * version). `revision` changes whenever an entry does, for memoised views over the map.
 */
export function useEntryReadings(initial: readonly Reading[]) {
  const [stored] = useState(() => buildStoredReadings(initial));
  const [revision, setRevision] = useState(0);

  const apply = useCallback(
    (rowIndex: number, readings: readonly Reading[]) => {
      if (readings.length === 0) return;
      let row = stored.get(rowIndex);
      if (!row) stored.set(rowIndex, (row = new Map()));
      for (const reading of readings) {
        const known = row.get(reading.channelId);
        // An answer overtaken by a newer one (two tabs) must not roll the version back.
        if (!known || known.version <= reading.version) row.set(reading.channelId, reading);
      }
      setRevision((n) => n + 1);
    },
    [stored],
  );

  return { stored, revision, apply };
}

import type {
  Channel,
  ChannelLimits,
  MismatchCell,
  Reading,
  ReadingFlag,
  ReadingPass,
  Resolution,
  Sheet,
  SheetGrid,
  SheetGridPass,
  SheetGridWire,
  SheetGridWirePass,
  SheetMismatches,
  SheetRow,
} from '@dialsheet/common';

// Wire-shaped sheets, readings and mismatches for component tests of the sheet pages.
const at = '2026-03-02T09:15:00.000Z';
export const SHEET_CAMPAIGN_ID = '10000000-0000-4000-8000-000000000001';
export const SHEET_RUN_ID = '30000000-0000-4000-8000-000000000001';
export const SHEET_ID = '60000000-0000-4000-8000-000000000001';
export const LEAD_ID = '00000000-0000-4000-8000-000000000001';
export const READER_ID = '00000000-0000-4000-8000-000000000002';
export const CHECKER_ID = '00000000-0000-4000-8000-000000000003';

export function makeSheetChannel(overrides: Partial<Channel> = {}): Channel {
  return {
    id: '50000000-0000-4000-8000-000000000001',
    campaignId: SHEET_CAMPAIGN_ID,
    name: 'Warm stream inlet temperature',
    symbol: 'T1',
    quantity: 'temperature',
    rawUnit: '°C',
    resolution: 0.1,
    rangeMin: -50,
    rangeMax: 200,
    fullScale: null,
    operatingMin: null,
    operatingMax: null,
    accuracy: null,
    plausibleMin: 5,
    plausibleMax: 90,
    position: 0,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

export function makeSheet(overrides: Partial<Sheet> = {}): Sheet {
  return {
    id: SHEET_ID,
    campaignId: SHEET_CAMPAIGN_ID,
    runId: SHEET_RUN_ID,
    name: 'Warm-up, every 2 s',
    startTime: 0,
    endTime: 10,
    interval: 2,
    channelIds: ['50000000-0000-4000-8000-000000000001'],
    rowCount: 6,
    readerId: READER_ID,
    checkerId: CHECKER_ID,
    status: 'open',
    progress: { pass1: { done: 0, total: 6 }, pass2: { done: 0, total: 6 } },
    pass1FinishedAt: null,
    pass2FinishedAt: null,
    lock: null,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

export function makeRows(count: number, interval = 2): SheetRow[] {
  return Array.from({ length: count }, (_, index) => ({ index, testTime: index * interval }));
}

export function makeReading(overrides: Partial<Reading> & Pick<Reading, 'rowIndex' | 'channelId' | 'pass' | 'rawText'>): Reading {
  const text = overrides.rawText.trim();
  const flag = text === '' ? 'blank' : text === '#unreadable' ? 'unreadable' : text === '#ambiguous' ? 'ambiguous' : null;
  return {
    sheetId: SHEET_ID,
    value: flag ? null : Number(text),
    flag,
    frameTime: overrides.rowIndex * 2 + 0.5,
    enteredBy: overrides.pass === 1 ? READER_ID : CHECKER_ID,
    version: 1,
    updatedAt: at,
    warnings: [],
    ...overrides,
  };
}

/** One reading per row for one channel and pass, from a list of typed texts. */
export function passReadings(pass: ReadingPass, channelId: string, texts: string[]): Reading[] {
  return texts.map((rawText, rowIndex) => makeReading({ rowIndex, channelId, pass, rawText }));
}

export function makeResolution(overrides: Partial<Resolution> & Pick<Resolution, 'rowIndex' | 'channelId' | 'rawText'>): Resolution {
  return {
    sheetId: SHEET_ID,
    value: Number(overrides.rawText),
    flag: null,
    reason: 'The frame shows it clearly',
    resolvedBy: CHECKER_ID,
    resolvedAt: at,
    version: 1,
    ...overrides,
  };
}

export function makeMismatchCell(pass1: Reading, pass2: Reading, resolution: Resolution | null = null): MismatchCell {
  return {
    rowIndex: pass1.rowIndex,
    testTime: pass1.rowIndex * 2,
    channelId: pass1.channelId,
    pass1,
    pass2,
    reasons: [`The passes differ: "${pass1.rawText}" (pass 1) and "${pass2.rawText}" (pass 2)`],
    resolution,
  };
}

export function makeMismatches(cells: MismatchCell[], overrides: Partial<SheetMismatches> = {}): SheetMismatches {
  const resolved = cells.filter((c) => c.resolution).length;
  return {
    sheetId: SHEET_ID,
    complete: true,
    cells,
    open: cells.length - resolved,
    resolved,
    byChannel: [],
    byPerson: [],
    ...overrides,
  };
}

/** What a grid says besides its passes, laid out or as sent. */
function gridHead(rows: SheetRow[], channelIds: string[], resolutions: Resolution[] | null) {
  return { sheetId: SHEET_ID, testTimes: rows.map((r) => r.testTime), channelIds, resolutions };
}

/** The readings that fall on the plan's rows and channels, each with its cell index (row × channels + column). */
function onPlan(readings: Reading[], rows: SheetRow[], channelIds: string[]): Array<{ r: Reading; i: number }> {
  return readings.flatMap((r) => {
    const col = channelIds.indexOf(r.channelId);
    return col < 0 || r.rowIndex < 0 || r.rowIndex >= rows.length ? [] : [{ r, i: r.rowIndex * channelIds.length + col }];
  });
}

/**
 * The sheet table's answer (`GET /sheets/:id/grid`) laid out from readings, as the server lays it
 * out: cell i is row floor(i / channels) and channel i % channels; readings off the plan are left out.
 */
export function makeSheetGrid({
  rows,
  channelIds,
  pass1,
  pass2,
  resolutions = null,
  editPass = null,
}: {
  rows: SheetRow[];
  channelIds: string[];
  pass1: Reading[] | null;
  pass2: Reading[] | null;
  resolutions?: Resolution[] | null;
  /** The pass the viewer may change: it alone carries versions and frames. */
  editPass?: ReadingPass | null;
}): SheetGrid {
  const layout = (readings: Reading[] | null, editable: boolean): SheetGridPass | null => {
    if (!readings) return null;
    const size = rows.length * channelIds.length;
    const out: SheetGridPass = {
      rawText: new Array<string | null>(size).fill(null),
      flag: new Array<Reading['flag']>(size).fill(null),
      edit: editable ? { version: new Array<number | null>(size).fill(null), frameTime: new Array<number | null>(size).fill(null) } : null,
      warnings: {},
    };
    for (const { r, i } of onPlan(readings, rows, channelIds)) {
      out.rawText[i] = r.rawText;
      out.flag[i] = r.flag;
      if (out.edit) {
        out.edit.version[i] = r.version;
        out.edit.frameTime[i] = r.frameTime;
      }
      if (r.warnings.length > 0) out.warnings[i] = r.warnings;
    }
    return out;
  };
  return { ...gridHead(rows, channelIds, resolutions), pass1: layout(pass1, editPass === 1), pass2: layout(pass2, editPass === 2) };
}

/**
 * The grid route's answer as the server sends it (`SheetGridWire`): each pass's entries only, in
 * reverse order (the server promises none), with their cell index; `layOutSheetGrid` turns it into
 * what `makeSheetGrid` gives. Limits default to none, so no entry carries a warning.
 */
export function makeSheetGridWire({
  limits,
  ...plan
}: Parameters<typeof makeSheetGrid>[0] & { limits?: ChannelLimits[] }): SheetGridWire {
  const { rows, channelIds, pass1, pass2, resolutions = null, editPass = null } = plan;
  const entries = (readings: Reading[] | null, editable: boolean): SheetGridWirePass | null => {
    if (!readings) return null;
    const on = onPlan(readings, rows, channelIds).reverse();
    const flagged = on.flatMap(({ r, i }): Array<[number, ReadingFlag]> => (r.flag === null ? [] : [[i, r.flag]]));
    const outside = on.flatMap(({ r, i }): Array<[number, number]> => (r.value === null ? [] : [[i, r.value]]));
    return {
      cell: on.map(({ i }) => i),
      rawText: on.map(({ r }) => r.rawText),
      flagged: flagged.length > 0 ? flagged : null,
      version: editable ? on.map(({ r }) => r.version) : null,
      frameTime: editable ? on.map(({ r }) => r.frameTime) : null,
      outside: outside.length > 0 ? outside : null,
    };
  };
  return {
    ...gridHead(rows, channelIds, resolutions),
    limits: limits ?? channelIds.map(() => ({})),
    pass1: entries(pass1, editPass === 1),
    pass2: entries(pass2, editPass === 2),
  };
}

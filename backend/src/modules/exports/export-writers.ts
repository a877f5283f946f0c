// From dataset records to the four export formats. Every writer reads the records once, in
// order, and writes as it reads, so a million readings cost no more memory than ten. Spreadsheet
// formats (CSV, XLSX) get numbers as numbers and every text cell through exportCell, which
// neutralises text that a spreadsheet would run as a formula (OWASP CSV Injection, CWE-1236).
// JSON is not opened by spreadsheets and keeps every text exactly as typed.

import { exportCell, type ExportProvenance, type ExportValue, type LongExportRow } from '@dialsheet/common';
import ExcelJS from 'exceljs';
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import type { SnapshotAnalysis, SnapshotCell, SnapshotChannel, SnapshotHeader, SnapshotItem, SnapshotRun, SnapshotSheet } from './snapshot';

/** What precedes the cells: everything a writer needs to label them. */
export interface DatasetContext {
  header: SnapshotHeader;
  runs: SnapshotRun[];
  channels: SnapshotChannel[];
  sheets: SnapshotSheet[];
  analyses: SnapshotAnalysis[];
  runById: Map<string, SnapshotRun>;
  channelById: Map<string, SnapshotChannel>;
  sheetById: Map<string, SnapshotSheet>;
}

export interface OpenDataset {
  context: DatasetContext;
  /** The cells in batches, in order. */
  cells: AsyncGenerator<SnapshotCell[]>;
}

/** Reads the records up to the first cells; the rest stay in the (lazy) cell stream. */
export async function openDataset(records: AsyncGenerator<SnapshotItem>): Promise<OpenDataset> {
  const context: Partial<DatasetContext> & Pick<DatasetContext, 'runs' | 'channels' | 'sheets' | 'analyses'> = {
    runs: [],
    channels: [],
    sheets: [],
    analyses: [],
  };
  let first: SnapshotCell[] | null = null;
  for (;;) {
    const next = await records.next();
    if (next.done) break;
    const item = next.value;
    if (Array.isArray(item)) {
      first = item;
      break;
    }
    if (item.type === 'header') context.header = item;
    else if (item.type === 'run') context.runs.push(item);
    else if (item.type === 'channel') context.channels.push(item);
    else if (item.type === 'sheet') context.sheets.push(item);
    else if (item.type === 'analysis') context.analyses.push(item);
  }
  if (!context.header) throw new Error('the dataset has no header record');
  const full: DatasetContext = {
    ...(context as DatasetContext),
    runById: new Map(context.runs.map((r) => [r.id, r])),
    channelById: new Map(context.channels.map((c) => [c.id, c])),
    sheetById: new Map(context.sheets.map((s) => [s.id, s])),
  };
  async function* cells(): AsyncGenerator<SnapshotCell[]> {
    try {
      if (first) yield first;
      for (;;) {
        const next = await records.next();
        if (next.done) return;
        if (Array.isArray(next.value)) yield next.value;
      }
    } finally {
      // Closes the cursor (or file) behind the records when the reader stops early.
      await records.return(undefined);
    }
  }
  return { context: full, cells: cells() };
}

/** One long-format row: the wire shape LongExportRow, names instead of ids. */
export function toLongRow(ctx: DatasetContext, cell: SnapshotCell): LongExportRow {
  const channel = ctx.channelById.get(cell.channelId);
  return {
    run: ctx.runById.get(cell.runId)?.name ?? cell.runId,
    sheet: ctx.sheetById.get(cell.sheetId)?.name ?? cell.sheetId,
    channel: channel?.symbol ?? cell.channelId,
    testTime: cell.testTime,
    videoTime: cell.videoTime,
    framePts: cell.final?.framePts ?? null,
    rawText: cell.final?.text ?? null,
    value: cell.final?.value ?? null,
    rawUnit: channel?.rawUnit ?? '',
    engineeringValue: cell.engineeringValue,
    engineeringUnit: channel?.engineeringUnit ?? '',
    flag: cell.final?.flag ?? null,
    status: cell.status,
    pass1Text: cell.pass1?.text ?? null,
    pass2Text: cell.pass2?.text ?? null,
    reader: cell.pass1?.by ?? null,
    checker: cell.pass2?.by ?? null,
    resolution: cell.resolution?.text ?? null,
    resolutionReason: cell.resolution?.reason ?? null,
    resolvedBy: cell.resolution?.by ?? null,
  };
}

/** Column headers of the long format, in LongExportRow order, with units where one unit fits every row. */
export const LONG_COLUMNS: ReadonlyArray<[keyof LongExportRow, string]> = [
  ['run', 'run'],
  ['sheet', 'sheet'],
  ['channel', 'channel'],
  ['testTime', 'test time [s]'],
  ['videoTime', 'video time [s]'],
  ['framePts', 'frame pts [s]'],
  ['rawText', 'raw text'],
  ['value', 'value'],
  ['rawUnit', 'raw unit'],
  ['engineeringValue', 'engineering value'],
  ['engineeringUnit', 'engineering unit'],
  ['flag', 'flag'],
  ['status', 'status'],
  ['pass1Text', 'pass 1 text'],
  ['pass2Text', 'pass 2 text'],
  ['reader', 'reader'],
  ['checker', 'checker'],
  ['resolution', 'resolution'],
  ['resolutionReason', 'resolution reason'],
  ['resolvedBy', 'resolved by'],
];

export function longValues(row: LongExportRow): ExportValue[] {
  return LONG_COLUMNS.map(([key]) => exportCell(row[key]));
}

const oneLine = (text: string) => text.replace(/[\r\n]+/g, ' ');

/** "# …" lines at the top of a CSV file: where it came from, and DRAFT when it is not a release. */
export function provenanceLines(p: ExportProvenance): string[] {
  const lines: string[] = [];
  if (p.kind === 'draft') {
    lines.push(
      `# DRAFT - not a signed release: live data of campaign "${oneLine(p.campaign.name)}", exported by ${oneLine(p.exportedBy)} at ${p.exportedAt}; values may still change`,
    );
  } else if (p.release) {
    lines.push(
      `# Release ${p.release.number} of campaign "${oneLine(p.campaign.name)}", signed by ${oneLine(p.release.signedBy)} at ${p.release.signedAt}; content SHA-256 ${p.release.contentHash}`,
    );
  }
  for (const run of p.runs) {
    const recording = run.recording ? `recording "${oneLine(run.recording.fileName)}" SHA-256 ${run.recording.sha256 ?? 'unknown'}` : 'no recording';
    const sync = run.sync ? `test time 0 s at video time ${run.sync.videoTimeAtTestZero} s, ${run.sync.rate} test s per video s` : 'no sync';
    lines.push(`# run "${oneLine(run.name)}": ${recording}; ${sync}`);
  }
  lines.push(`# ${p.software.name} ${p.software.version}`);
  return lines.map((l) => `${l}\n`);
}

/** A field that must be quoted (RFC 4180): a comma, quote or line break, or a "#" (see below). */
const NEEDS_QUOTES = /[",\r\n#]/;

/**
 * One CSV record (RFC 4180, "\n" line ends): numbers as bare numbers, empty for null, text quoted
 * only when needed. A field holding a "#" is quoted too: readers told that "#" starts a comment
 * (the provenance lines) cut an unquoted field at it, and a first column such as a run named "#3"
 * would turn the whole record into a comment. Written by hand rather
 * than with csv-stringify: on the export bench csv-stringify managed about 170 000 rows/s on its
 * own, this about 900 000, and the export as a whole must keep up with PostgreSQL's COPY.
 */
export function csvRecord(values: readonly ExportValue[]): string {
  let line = '';
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (i > 0) line += ',';
    if (v === null) continue;
    if (typeof v === 'number') line += String(v);
    else if (typeof v === 'boolean') line += v ? 'true' : 'false';
    else line += NEEDS_QUOTES.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
  }
  return `${line}\n`;
}

/** Writes header and rows as CSV, one write per batch of cells, waiting for the socket when it asks. */
async function writeCsvBatches(out: Writable, header: ExportValue[], batches: AsyncIterable<ExportValue[][]>): Promise<void> {
  await writeChunk(out, csvRecord(header));
  for await (const rows of batches) if (rows.length > 0) await writeChunk(out, rows.map(csvRecord).join(''));
  out.end();
}

export async function writeCsvLong(out: Writable, prov: ExportProvenance, data: OpenDataset): Promise<void> {
  const { context, cells } = data;
  for (const line of provenanceLines(prov)) out.write(line);
  async function* rows(): AsyncGenerator<ExportValue[][]> {
    for await (const batch of cells) yield batch.map((cell) => longValues(toLongRow(context, cell)));
  }
  await writeCsvBatches(
    out,
    LONG_COLUMNS.map(([, label]) => label),
    rows(),
  );
}

/** Column label of a channel in the wide format: "T1 [°C]". */
export function wideLabel(c: SnapshotChannel): string {
  return `${c.symbol} [${c.engineeringUnit}]`;
}

/**
 * One row per timestamp of a sheet, one column per channel (engineering value in the channel's
 * engineering unit; a flag word where the final entry is a flag; empty where nothing counts yet).
 */
export async function writeCsvWide(out: Writable, prov: ExportProvenance, data: OpenDataset): Promise<void> {
  const { context, cells } = data;
  for (const line of provenanceLines(prov)) out.write(line);
  const columns = context.channels;
  const index = new Map(columns.map((c, i) => [c.id, i]));
  async function* rows(): AsyncGenerator<ExportValue[][]> {
    let key = '';
    let row: ExportValue[] | null = null;
    for await (const batch of cells) {
      const done: ExportValue[][] = [];
      for (const cell of batch) {
        const k = `${cell.sheetId}:${cell.row}`;
        if (k !== key) {
          if (row) done.push(row);
          key = k;
          row = [
            exportCell(context.runById.get(cell.runId)?.name ?? cell.runId),
            exportCell(context.sheetById.get(cell.sheetId)?.name ?? cell.sheetId),
            cell.testTime,
            cell.videoTime,
            ...columns.map(() => null),
          ];
        }
        const i = index.get(cell.channelId);
        if (row && i !== undefined) row[4 + i] = cell.engineeringValue ?? exportCell(cell.final?.flag ?? null);
      }
      yield done;
    }
    if (row) yield [row];
  }
  await writeCsvBatches(out, ['run', 'sheet', 'test time [s]', 'video time [s]', ...columns.map(wideLabel)], rows());
}

async function writeChunk(out: Writable, chunk: string): Promise<void> {
  if (!out.write(chunk)) await once(out, 'drain');
}

export const JSON_EXPORT_FORMAT = 'dialsheet-export';
export const JSON_EXPORT_VERSION = 1;

/**
 * The JSON export (schema: export-schema.json beside this file): provenance, runs, channels with
 * calibrations, sheets, analyses, then the readings as LongExportRow objects, written piecewise.
 */
export async function writeJson(out: Writable, prov: ExportProvenance, data: OpenDataset): Promise<void> {
  const { context, cells } = data;
  const strip = <T extends { type: string }>(r: T): Omit<T, 'type'> => {
    const { type: _type, ...rest } = r;
    return rest;
  };
  await writeChunk(
    out,
    `{"format":${JSON.stringify(JSON_EXPORT_FORMAT)},"version":${JSON_EXPORT_VERSION},"draft":${prov.kind === 'draft'},` +
      `"provenance":${JSON.stringify(prov)},` +
      `"runs":${JSON.stringify(context.runs.map(strip))},` +
      `"channels":${JSON.stringify(context.channels.map(strip))},` +
      `"sheets":${JSON.stringify(context.sheets.map(strip))},` +
      `"analyses":${JSON.stringify(context.analyses.map(strip))},` +
      `"readings":[`,
  );
  let first = true;
  for await (const batch of cells) {
    if (batch.length === 0) continue;
    await writeChunk(out, `${first ? '\n' : ',\n'}${batch.map((cell) => JSON.stringify(toLongRow(context, cell))).join(',\n')}`);
    first = false;
  }
  await writeChunk(out, '\n]}\n');
  out.end();
}

/** Rows of the "stable values and fits" sheet. */
export const STABLE_COLUMNS = [
  'analysis', 'status', 'run', 'channel', 't* [s]', 'window from [s]', 'window to [s]', 'value', 'unit', 'expanded uncertainty',
  'coverage factor', 'raw value', 'raw unit', 'n', 'slope [unit/min]', 'intercept', 'R²', 'residual s.d.', 'stability rule', 'stable', 'warnings',
];

/** Rows of the "balance checks" sheet. */
export const BALANCE_COLUMNS = [
  'analysis', 'status', 'kind', 'Σin', 'Σout', 'unit', 'ratio Σout/Σin', 'closure [%]', 'expanded uncertainty [%]', 'coverage factor', 'E_n', 'pass',
];

type Loose = Record<string, unknown> | undefined;
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const str = (v: unknown): string | null => (typeof v === 'string' ? v : null);
const obj = (v: unknown): Loose => (v && typeof v === 'object' ? (v as Record<string, unknown>) : undefined);

export function stableValueRows(ctx: DatasetContext): ExportValue[][] {
  return ctx.analyses
    .filter((a) => a.kind === 'stable-value')
    .map((a) => {
      const input = obj(a.input);
      const result = obj(a.result);
      const stable = obj(result?.stable);
      const fit = obj(stable?.fit);
      const stability = obj(result?.stability);
      const window = obj(input?.window);
      const channelId = str(input?.channelId);
      return [
        a.name,
        a.status,
        ctx.runById.get(str(input?.runId) ?? '')?.name ?? str(input?.runId),
        (channelId && ctx.channelById.get(channelId)?.symbol) ?? channelId,
        num(stable?.tStar) ?? num(input?.tStar),
        num(window?.from) ?? num(window?.start),
        num(window?.to) ?? num(window?.end),
        num(stable?.value),
        str(stable?.unit),
        num(stable?.expandedUncertainty),
        num(input?.coverageFactor) ?? 2,
        num(stable?.rawValue),
        str(stable?.rawUnit),
        num(fit?.n),
        num(fit?.slopePerMinute),
        num(fit?.intercept),
        num(fit?.rSquared),
        num(fit?.residualSd),
        str(stability?.rule),
        typeof stability?.pass === 'boolean' ? (stability.pass ? 'yes' : 'no') : null,
        Array.isArray(stable?.warnings) ? (stable.warnings as unknown[]).join('; ') : null,
      ].map((v) => exportCell(v as ExportValue));
    });
}

export function balanceRows(ctx: DatasetContext): ExportValue[][] {
  const rows: ExportValue[][] = [];
  for (const a of ctx.analyses.filter((x) => x.kind === 'balance')) {
    const result = obj(a.result);
    for (const kind of ['mass', 'energy'] as const) {
      const b = obj(result?.[kind]);
      if (!b) continue;
      rows.push(
        [
          a.name, a.status, kind, num(b.sumIn), num(b.sumOut), str(b.unit), num(b.ratio), num(b.closurePercent),
          num(b.expandedUncertaintyPercent), num(b.coverageFactor), num(b.normalisedError), typeof b.pass === 'boolean' ? (b.pass ? 'yes' : 'no') : null,
        ].map((v) => exportCell(v as ExportValue)),
      );
    }
  }
  return rows;
}

export const CHANNEL_COLUMNS = [
  'symbol', 'name', 'quantity', 'raw unit', 'resolution', 'range min', 'range max', 'full scale', 'engineering unit', 'calibration version', 'calibration chain (JSON)',
];

export function channelRows(ctx: DatasetContext): ExportValue[][] {
  return ctx.channels.map((c) =>
    [
      c.symbol, c.name, c.quantity, c.rawUnit, c.resolution, c.rangeMin, c.rangeMax, c.fullScale, c.engineeringUnit,
      c.calibration?.version ?? null, c.calibration ? JSON.stringify(c.calibration.chain) : null,
    ].map((v) => exportCell(v as ExportValue)),
  );
}

export function provenanceRows(p: ExportProvenance): ExportValue[][] {
  const rows: Array<[string, ExportValue]> = [
    ['kind', p.kind === 'draft' ? 'DRAFT - not a signed release' : 'release'],
    ['campaign', p.campaign.name],
    ['campaign id', p.campaign.id],
  ];
  if (p.release) {
    rows.push(
      ['release number', p.release.number],
      ['release id', p.release.id],
      ['content SHA-256', p.release.contentHash],
      ['signed by', p.release.signedBy],
      ['signed at', p.release.signedAt],
    );
  }
  for (const run of p.runs) {
    rows.push(
      [`run "${run.name}" recording`, run.recording?.fileName ?? null],
      [`run "${run.name}" recording SHA-256`, run.recording?.sha256 ?? null],
      [`run "${run.name}" video time at test time 0 [s]`, run.sync?.videoTimeAtTestZero ?? null],
      [`run "${run.name}" test s per video s`, run.sync?.rate ?? null],
    );
  }
  rows.push(['software', `${p.software.name} ${p.software.version}`], ['exported at', p.exportedAt], ['exported by', p.exportedBy]);
  return rows.map(([k, v]) => [exportCell(k), exportCell(v)]);
}

/**
 * XLSX through exceljs's streaming writer: the readings sheet is written row by row and committed
 * before the small sheets that follow, so the workbook never sits whole in memory.
 */
export async function writeXlsx(out: Writable, prov: ExportProvenance, data: OpenDataset): Promise<void> {
  const { context, cells } = data;
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useStyles: false, useSharedStrings: false });
  workbook.creator = `${prov.software.name} ${prov.software.version}`;
  const readings = workbook.addWorksheet('readings');
  readings.addRow(LONG_COLUMNS.map(([, label]) => label)).commit();
  for await (const batch of cells) {
    for (const cell of batch) readings.addRow(longValues(toLongRow(context, cell))).commit();
    // Let the socket catch up now and then: exceljs itself does not wait for a slow reader.
    if (out.writableNeedDrain) await once(out, 'drain');
  }
  readings.commit();
  const sheets: Array<[string, string[], ExportValue[][]]> = [
    ['channels and calibrations', CHANNEL_COLUMNS, channelRows(context)],
    ['stable values and fits', STABLE_COLUMNS, stableValueRows(context)],
    ['balance checks', BALANCE_COLUMNS, balanceRows(context)],
    ['provenance', ['field', 'value'], provenanceRows(prov)],
  ];
  for (const [name, header, rows] of sheets) {
    const ws = workbook.addWorksheet(name);
    ws.addRow(header).commit();
    for (const row of rows) ws.addRow(row).commit();
    ws.commit();
  }
  await workbook.commit();
}

import type { ExportProvenance } from '@dialsheet/common';
import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { csvRecord, longValues, openDataset, toLongRow, writeCsvLong } from './export-writers';
import { exportFileName, fileSlug, parseFormat } from './exports.service';
import { snapshotLine, type SnapshotCell, type SnapshotItem } from './snapshot';

const header: SnapshotItem = { type: 'header', format: 'dialsheet-snapshot', version: 1, campaign: { id: 'c1', name: 'Core' }, runIds: ['r1'] } as SnapshotItem;
const run: SnapshotItem = {
  type: 'run',
  id: 'r1',
  name: '=cmd|run',
  runDate: null,
  configuration: '',
  operator: '',
  sync: { first: { videoTime: 2, testTime: 0 } },
  syncSummary: { videoTimeAtTestZero: 2, rate: 1 },
  recording: { fileName: 'rig.mp4', sha256: 'a'.repeat(64), sizeBytes: 10 },
};
const channel: SnapshotItem = {
  type: 'channel',
  id: 'ch1',
  name: 'Warm inlet',
  symbol: 'T1',
  quantity: 'temperature',
  rawUnit: '°C',
  resolution: 0.1,
  rangeMin: -50,
  rangeMax: 200,
  fullScale: null,
  accuracy: null,
  position: 0,
  calibration: null,
  engineeringUnit: '°C',
  calibrationProblem: null,
};
const sheet: SnapshotItem = {
  type: 'sheet',
  id: 's1',
  runId: 'r1',
  name: '@sheet',
  startTime: 0,
  endTime: 2,
  interval: 2,
  rows: 2,
  channelIds: ['ch1'],
  reader: null,
  checker: null,
  pass1FinishedAt: null,
  pass2FinishedAt: null,
};
const cell: SnapshotCell = {
  type: 'cell',
  runId: 'r1',
  sheetId: 's1',
  channelId: 'ch1',
  row: 0,
  testTime: 0,
  videoTime: 2,
  status: 'resolved',
  final: { text: '-3.5', value: -3.5, flag: null, framePts: 2.017 },
  engineeringValue: -3.5,
  pass1: { text: '-3.5', value: -3.5, flag: null, frameTime: 2.017, by: 'Pat' },
  pass2: { text: '-3.6', value: -3.6, flag: null, frameTime: 2.034, by: '+Sam' },
  resolution: { text: '-3.5', value: -3.5, flag: null, reason: '=1+2', by: 'Lee' },
};

async function* items(): AsyncGenerator<SnapshotItem> {
  yield header;
  yield run;
  yield channel;
  yield sheet;
  yield [cell];
}

const prov: ExportProvenance = {
  kind: 'draft',
  campaign: { id: 'c1', name: 'Core\nline' },
  release: null,
  runs: [{ id: 'r1', name: 'Run 1', recording: { fileName: 'rig.mp4', sha256: 'a'.repeat(64) }, sync: { videoTimeAtTestZero: 2, rate: 1 } }],
  software: { name: 'Dialsheet', version: '0.1.0' },
  exportedAt: '2026-12-02T10:00:00.000Z',
  exportedBy: 'Pat',
};

describe('export writers', () => {
  it('keeps numbers as numbers and neutralises formula-like text (OWASP CSV Injection)', async () => {
    const data = await openDataset(items());
    const out = new PassThrough();
    const chunks: Buffer[] = [];
    out.on('data', (c: Buffer) => chunks.push(c));
    await writeCsvLong(out, prov, data);
    const text = Buffer.concat(chunks).toString('utf8');
    const lines = text.trimEnd().split('\n');
    // Provenance: DRAFT first, a line per run, the software; a newline in a name cannot break out.
    expect(lines[0]).toBe('# DRAFT - not a signed release: live data of campaign "Core line", exported by Pat at 2026-12-02T10:00:00.000Z; values may still change');
    expect(lines[1]).toBe(`# run "Run 1": recording "rig.mp4" SHA-256 ${'a'.repeat(64)}; test time 0 s at video time 2 s, 1 test s per video s`);
    expect(lines[2]).toBe('# Dialsheet 0.1.0');
    expect(lines[3].startsWith('run,sheet,channel,test time [s],')).toBe(true);
    // Text cells starting with = @ - + get a quote; the value -3.5 stays a bare number.
    expect(lines[4]).toBe("'=cmd|run,'@sheet,T1,0,2,2.017,'-3.5,-3.5,°C,-3.5,°C,,resolved,'-3.5,'-3.6,Pat,'+Sam,'-3.5,'=1+2,Lee");
  });

  it('writes RFC 4180 records that a CSV parser (csv-parse) reads back field for field', () => {
    const fields = ['plain', 'a,b', 'say "hi"', 'two\nlines', 'cr\rhere', '#3', 'x#y', '', '°C µs', -0.5, 1e-7, null, true];
    const text = csvRecord(fields);
    expect(text).toBe('plain,"a,b","say ""hi""","two\nlines","cr\rhere","#3","x#y",,°C µs,-0.5,1e-7,,true\n');
    const [back] = parse(text, { comment: '#' }) as string[][];
    expect(back).toEqual(['plain', 'a,b', 'say "hi"', 'two\nlines', 'cr\rhere', '#3', 'x#y', '', '°C µs', '-0.5', '1e-7', '', 'true']);
    // A "#" inside a field does not start a comment, and a record starting with one is still a record.
    expect(parse(csvRecord(['#3', 1]), { comment: '#' })).toEqual([['#3', '1']]);
  });

  it('maps a cell to the LongExportRow wire shape', async () => {
    const { context } = await openDataset(items());
    expect(toLongRow(context, cell)).toMatchObject({ run: '=cmd|run', channel: 'T1', value: -3.5, status: 'resolved', reader: 'Pat', checker: '+Sam', resolvedBy: 'Lee' });
    expect(longValues(toLongRow(context, cell))[7]).toBe(-3.5);
  });

  it('writes canonical snapshot lines: same record, same bytes', () => {
    expect(snapshotLine(cell)).toBe(snapshotLine(structuredClone(cell)));
    expect(snapshotLine(cell).endsWith('}\n')).toBe(true);
    expect(snapshotLine(cell)).not.toContain(' ');
  });

  it('names files safely and refuses unknown formats', () => {
    expect(fileSlug('Heat-recovery core: "soak" / ÄÖ')).toBe('heat-recovery-core-soak-ao');
    expect(fileSlug('***')).toBe('campaign');
    expect(exportFileName('Core', 'csv-long', { number: 3 }, new Date('2026-12-02T10:05:00Z'))).toBe('dialsheet-core-release-3.long.csv');
    expect(exportFileName('Core', 'xlsx', null, new Date('2026-12-02T10:05:00Z'))).toBe('dialsheet-core-DRAFT-20261202-1005.xlsx');
    expect(() => parseFormat('pdf')).toThrow();
    expect(() => parseFormat(undefined)).toThrow();
    expect(parseFormat('json')).toBe('json');
  });
});

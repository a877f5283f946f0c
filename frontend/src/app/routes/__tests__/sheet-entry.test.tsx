import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import {
  frameIndexAt,
  parseReading,
  type Channel,
  type DisplayRegion,
  type Reading,
  type SaveRowRequest,
  type Sheet,
  type SheetRow,
} from '@dialsheet/common';
import { act, findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeRecording, makeRun, makeUser } from '@/testing/fixtures';
import type { StubRequest } from '@/testing/fetch-stub';
import userEvent from '@testing-library/user-event';

const campaignId = '10000000-0000-4000-8000-000000000001';
const runId = '30000000-0000-4000-8000-0000000000e1';
const sheetId = '60000000-0000-4000-8000-000000000001';
const readerId = '00000000-0000-4000-8000-0000000000a1';
const checkerId = '00000000-0000-4000-8000-0000000000c1';
const at = '2026-03-02T09:15:00.000Z';

function channel(overrides: Partial<Channel> & Pick<Channel, 'id' | 'symbol' | 'name' | 'rawUnit'>): Channel {
  return {
    campaignId,
    quantity: 'temperature',
    resolution: 0.1,
    rangeMin: 0,
    rangeMax: 100,
    fullScale: null,
    operatingMin: null,
    operatingMax: null,
    accuracy: null,
    plausibleMin: null,
    plausibleMax: null,
    position: 0,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

const t1 = channel({ id: '50000000-0000-4000-8000-000000000001', symbol: 'T1', name: 'Warm inlet', rawUnit: '°C', plausibleMin: 5, plausibleMax: 60 });
const fm = channel({
  id: '50000000-0000-4000-8000-000000000005',
  symbol: 'FM',
  name: 'Flow meter',
  rawUnit: 'V',
  quantity: 'voltage',
  resolution: 0.001,
  rangeMax: 5,
  operatingMin: 0,
  operatingMax: 5,
  position: 1,
});

/** 30 fps for 10 s, printed to the microsecond as ffprobe does. */
const frameTimes = Array.from({ length: 300 }, (_, k) => Number((k / 30).toFixed(6)));
/** Test time 0 is video time 1 s: rows every 2 s fall on frames 30, 90, 150, 210. */
const sync = { first: { videoTime: 1, testTime: 0 } };
const rows: SheetRow[] = [0, 2, 4, 6].map((testTime, index) => ({ index, testTime }));
const rowFrame = [30, 90, 150, 210];

function makeSheet(overrides: Partial<Sheet> = {}): Sheet {
  return {
    id: sheetId,
    campaignId,
    runId,
    name: 'Warm-up, every 2 s',
    startTime: 0,
    endTime: 6,
    interval: 2,
    channelIds: [t1.id, fm.id],
    rowCount: rows.length,
    readerId,
    checkerId,
    status: 'open',
    progress: { pass1: { done: 0, total: 8 }, pass2: { done: 0, total: 8 } },
    pass1FinishedAt: null,
    pass2FinishedAt: null,
    lock: null,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

function storedReading(rowIndex: number, channelId: string, rawText: string, pass: 1 | 2, version = 1): Reading {
  const parsed = parseReading(rawText);
  return {
    sheetId,
    rowIndex,
    channelId,
    pass,
    rawText,
    value: parsed.kind === 'number' ? parsed.value : null,
    flag: parsed.kind === 'flag' ? parsed.flag : null,
    frameTime: frameTimes[rowFrame[rowIndex]],
    enteredBy: pass === 1 ? readerId : checkerId,
    version,
    updatedAt: at,
    warnings: [],
  };
}

// jsdom decodes no video. requestVideoFrameCallback is the browser's word that a frame reached
// the compositor; here the test plays the decoder and compositor: each element presents the frame
// its currentTime falls in (what a finished seek shows).
type FrameCallback = (now: number, metadata: { mediaTime: number }) => void;
let pending: Map<number, { video: HTMLVideoElement; callback: FrameCallback }>;
let nextHandle: number;
let drawn: Array<{ canvas: HTMLCanvasElement; args: unknown[] }>;

function presentFrames(): void {
  const waiting = [...pending.values()];
  pending.clear();
  act(() => {
    for (const { video, callback } of waiting) {
      const k = Math.max(frameIndexAt(frameTimes, video.currentTime), 0);
      callback(performance.now(), { mediaTime: frameTimes[k] });
    }
  });
}

beforeEach(() => {
  pending = new Map();
  nextHandle = 1;
  drawn = [];
  Object.defineProperty(HTMLVideoElement.prototype, 'requestVideoFrameCallback', {
    configurable: true,
    value(this: HTMLVideoElement, callback: FrameCallback) {
      const handle = nextHandle++;
      pending.set(handle, { video: this, callback });
      return handle;
    },
  });
  Object.defineProperty(HTMLVideoElement.prototype, 'cancelVideoFrameCallback', {
    configurable: true,
    value(handle: number) {
      pending.delete(handle);
    },
  });
  Object.defineProperty(HTMLVideoElement.prototype, 'videoWidth', { configurable: true, get: () => 640 });
  Object.defineProperty(HTMLVideoElement.prototype, 'videoHeight', { configurable: true, get: () => 360 });
  // A 2D context that records what is drawn (jsdom has no canvas).
  vi.spyOn(HTMLCanvasElement.prototype, 'getContext').mockImplementation(function (this: HTMLCanvasElement) {
    return { imageSmoothingQuality: 'low', drawImage: (...args: unknown[]) => drawn.push({ canvas: this, args }) } as unknown as CanvasRenderingContext2D;
  } as unknown as HTMLCanvasElement['getContext']);
  performance.clearMarks();
});

afterEach(() => {
  delete (HTMLVideoElement.prototype as Partial<HTMLVideoElement>).requestVideoFrameCallback;
  delete (HTMLVideoElement.prototype as Partial<HTMLVideoElement>).cancelVideoFrameCallback;
  delete (HTMLVideoElement.prototype as { videoWidth?: number }).videoWidth;
  delete (HTMLVideoElement.prototype as { videoHeight?: number }).videoHeight;
});

interface Setup {
  userId?: string;
  sheet?: Sheet | (() => Sheet);
  readings?: Reading[];
  regions?: DisplayRegion[];
  saveRow?: (request: StubRequest) => { status?: number; body?: unknown };
  finishPass?: (request: StubRequest) => { status?: number; body?: unknown };
}

function renderEntry({ userId = readerId, sheet = makeSheet(), readings = [], regions = [], saveRow, finishPass }: Setup = {}) {
  const recording = makeRecording({ runId });
  const run = makeRun({ id: runId, recording, sync });
  const roles = userId === readerId ? (['reader'] as const) : userId === checkerId ? (['checker'] as const) : (['engineer'] as const);
  const stored = new Map<string, Reading>();
  const view = renderApp(`/campaigns/${campaignId}/sheets/${sheetId}/entry`, {
    user: makeUser({ id: userId, name: 'Entry Person' }),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: [...roles] })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: [...roles] }) },
      'GET /api/sheets/:sheetId': () => ({ body: typeof sheet === 'function' ? sheet() : sheet }),
      'POST /api/sheets/:sheetId/passes/:pass/finish': (request: StubRequest) =>
        finishPass ? finishPass(request) : { status: 500, body: { statusCode: 500, message: 'not expected' } },
      'GET /api/sheets/:sheetId/rows': { body: rows },
      'GET /api/sheets/:sheetId/readings': ({ query }: StubRequest) => ({ body: readings.filter((r) => String(r.pass) === query.get('pass')) }),
      'GET /api/runs/:runId': { body: run },
      'GET /api/runs/:runId/recording': { body: recording },
      'GET /api/recordings/:recordingId/frames': { body: { recordingId: recording.id, times: frameTimes, keyframeTimes: [0] } },
      'POST /api/recordings/:recordingId/media-urls': {
        body: {
          proxyUrl: `/api/media/${recording.id}/proxy?exp=4102444800&sig=abc`,
          originalUrl: `/api/media/${recording.id}/original?exp=4102444800&sig=abc`,
          posterUrl: null,
          expiresAt: '2099-12-31T23:59:59.000Z',
        },
      },
      'GET /api/campaigns/:campaignId/channels': { body: [t1, fm] },
      'GET /api/runs/:runId/display-regions': { body: regions },
      'PUT /api/sheets/:sheetId/rows/:rowIndex': (request: StubRequest) => {
        if (saveRow) return saveRow(request);
        const body = request.body as SaveRowRequest;
        const rowIndex = Number(request.params.rowIndex);
        return {
          body: {
            readings: body.readings.map((input) => {
              const key = `${rowIndex}:${input.channelId}`;
              const before = stored.get(key);
              const saved = { ...storedReading(rowIndex, input.channelId, input.rawText, body.pass, before ? before.version + 1 : 1), frameTime: input.frameTime ?? null };
              stored.set(key, saved);
              return saved;
            }),
          },
        };
      },
    },
  });
  return view;
}

const input = (symbol: string) => screen.getByRole('textbox', { name: new RegExp(`^${symbol} `) });
const rowTitle = () => screen.getByTestId('entry-row-title');
const saves = (network: ReturnType<typeof renderEntry>['network']) => network.callsTo('PUT /api/sheets/:sheetId/rows/:rowIndex');

async function openEntry(setup?: Setup) {
  const view = renderEntry(setup);
  // The first test of the file also compiles the lazily loaded page: give it room on a busy machine.
  await screen.findByTestId('entry-screen', {}, { timeout: 20_000 });
  await waitFor(() => expect(input('T1')).toHaveFocus());
  // The first frame and the next row's frame decode.
  presentFrames();
  return view;
}

describe('sheet entry screen', () => {
  it('moves from channel to channel on Enter and saves the row, exactly as typed, with its frame time', async () => {
    const { user, network } = await openEntry({ regions: [{ runId, channelId: t1.id, x: 0.25, y: 0.5, width: 0.1, height: 0.05 }] });
    expect(rowTitle()).toHaveTextContent('Row 1 of 4');
    expect(screen.getByTestId('entry-frame-index')).toHaveTextContent('30');
    // The crop of T1's region was drawn from the frame on screen: fractions of the 640 × 360 picture.
    const crop = screen.getByTestId('crop-T1');
    await waitFor(() => expect(drawn.filter((d) => d.canvas === crop).length).toBeGreaterThan(0));
    expect(drawn.filter((d) => d.canvas === crop).at(-1)?.args.slice(1, 5)).toEqual([160, 180, 64, 18]);

    await user.keyboard('21.50{Enter}');
    expect(input('FM')).toHaveFocus();
    expect(saves(network)).toHaveLength(0);

    await user.keyboard('{Control>}u{/Control}');
    expect(input('FM')).toHaveValue('#unreadable');
    const videos = screen.getByRole('region', { name: 'Video' }).querySelectorAll('video');
    const [first, second] = [...videos];
    expect(first.dataset.onScreen).toBe('true');
    // The hidden element already waits on the next row's frame, in its middle.
    expect(second.currentTime).toBeCloseTo((frameTimes[90] + frameTimes[91]) / 2, 6);
    const firstTimeBefore = first.currentTime;

    await user.keyboard('{Enter}');

    await waitFor(() => expect(saves(network)).toHaveLength(1));
    const save = saves(network)[0];
    expect(save.params.rowIndex).toBe('0');
    expect(save.body).toEqual({
      pass: 1,
      readings: [
        { channelId: t1.id, rawText: '21.50', frameTime: 1, baseVersion: null },
        { channelId: fm.id, rawText: '#unreadable', frameTime: 1, baseVersion: null },
      ],
    });
    // The next row: its first input is ready and the pre-sought element is on screen, unsought.
    expect(rowTitle()).toHaveTextContent('Row 2 of 4');
    await waitFor(() => expect(input('T1')).toHaveFocus());
    expect(input('T1')).toHaveValue('');
    expect(second.dataset.onScreen).toBe('true');
    expect(first.dataset.onScreen).toBe('false');
    await waitFor(() => expect(screen.getByTestId('entry-frame-index')).toHaveTextContent('90'));
    // The element now hidden moves on to the row after.
    expect(first.currentTime).not.toBe(firstTimeBefore);
    expect(first.currentTime).toBeCloseTo((frameTimes[150] + frameTimes[151]) / 2, 6);

    const marks = (name: string) => performance.getEntriesByName(name).map((m) => (m as PerformanceMark).detail as Record<string, unknown>);
    expect(marks('dialsheet:step-start')).toEqual([{ rowIndex: 1 }]);
    expect(marks('dialsheet:input-ready')).toEqual([{ rowIndex: 1 }]);
    await waitFor(() => expect(marks('dialsheet:frame-shown')).toEqual([{ rowIndex: 1, mediaTime: 3, expectedPts: 3, wrongFramesSeen: 0 }]));
    await waitFor(() => expect(screen.getByTestId('entry-queue-status')).toHaveTextContent('All rows saved'));
    // The row list follows in a deferred render.
    await waitFor(() => expect(screen.getByTestId('entry-row-0')).toHaveAttribute('data-state', 'saved'));
    expect(network.unhandled).toEqual([]);
  });

  it('records the frame actually read after stepping the video a frame on', async () => {
    const { user, network } = await openEntry();
    await user.keyboard('{Alt>}{ArrowRight}{/Alt}{Alt>}{ArrowRight}{/Alt}');
    presentFrames();
    expect(screen.getByTestId('entry-frame-index')).toHaveTextContent('32');
    expect(screen.getByTestId('entry-frame-offset')).toHaveTextContent('+2 frames');
    await user.keyboard('{Control>},{/Control}');
    presentFrames();
    expect(screen.getByTestId('entry-frame-index')).toHaveTextContent('31');

    await user.keyboard('20.0{Enter}1.234{Enter}');
    await waitFor(() => expect(saves(network)).toHaveLength(1));
    const body = saves(network)[0].body as SaveRowRequest;
    expect(body.readings.map((r) => r.frameTime)).toEqual([frameTimes[31], frameTimes[31]]);
  });

  it('shows the parser’s message under a bad value and neither saves nor moves on', async () => {
    const { user, network } = await openEntry();
    await user.keyboard('2O.5');
    const t1Input = input('T1');
    expect(t1Input).toHaveAttribute('aria-invalid', 'true');
    const expected = parseReading('2O.5');
    expect(expected.kind).toBe('error');
    const cell = screen.getByTestId('entry-cell-T1');
    expect(within(cell).getByText(expected.kind === 'error' ? expected.message : '')).toBeInTheDocument();

    await user.keyboard('{Enter}');
    expect(t1Input).toHaveFocus();
    // Going on to the last channel and confirming the row is refused too: the cursor returns to the error.
    await user.keyboard('{Tab}');
    expect(input('FM')).toHaveFocus();
    await user.keyboard('1.1{Enter}');
    expect(t1Input).toHaveFocus();
    await act(() => new Promise((resolve) => setTimeout(resolve, 50)));
    expect(saves(network)).toHaveLength(0);
    expect(rowTitle()).toHaveTextContent('Row 1 of 4');

    // A value outside the plausible range is flagged and still saved.
    await user.clear(t1Input);
    await user.keyboard('75.0');
    expect(t1Input).not.toHaveAttribute('aria-invalid');
    expect(within(cell).getByText('above plausible')).toBeInTheDocument();
    await user.keyboard('{Enter}{Enter}');
    await waitFor(() => expect(saves(network)).toHaveLength(1));
    expect((saves(network)[0].body as SaveRowRequest).readings.map((r) => r.rawText)).toEqual(['75.0', '1.1']);
  });

  it('puts keys typed right after Enter into the next row’s first cell, and still saves the row left', async () => {
    const { network } = await openEntry();
    // No pause between keys: the next row's keys arrive before the saved row is even queued
    // (that waits for the new frame to be painted).
    const fast = userEvent.setup({ delay: null });
    await fast.keyboard('19.9{Enter}0.5{Enter}20.3');
    expect(saves(network)).toHaveLength(0);
    expect(input('T1')).toHaveFocus();
    await waitFor(() => expect(rowTitle()).toHaveTextContent('Row 2 of 4'));
    expect(input('T1')).toHaveValue('20.3');
    expect(input('FM')).toHaveValue('');
    await waitFor(() => expect(saves(network)).toHaveLength(1));
    expect((saves(network)[0].body as SaveRowRequest).readings.map((r) => r.rawText)).toEqual(['19.9', '0.5']);
    expect(saves(network)[0].params.rowIndex).toBe('0');
    // And the typed text belongs to row 2: Enter there goes on to FM of row 2.
    await fast.keyboard('{Enter}');
    expect(input('FM')).toHaveFocus();
    expect(rowTitle()).toHaveTextContent('Row 2 of 4');
  });

  it('goes back with Shift+Enter: to the previous channel, then to the previous row’s last channel', async () => {
    const { user } = await openEntry();
    await user.keyboard('19.9{Enter}0.5{Enter}');
    await waitFor(() => expect(rowTitle()).toHaveTextContent('Row 2 of 4'));
    await user.keyboard('20.1{Enter}');
    expect(input('FM')).toHaveFocus();

    await user.keyboard('{Shift>}{Enter}{/Shift}');
    expect(input('T1')).toHaveFocus();
    expect(input('T1')).toHaveValue('20.1');

    await user.keyboard('{Shift>}{Enter}{/Shift}');
    await waitFor(() => expect(rowTitle()).toHaveTextContent('Row 1 of 4'));
    await waitFor(() => expect(input('FM')).toHaveFocus());
    expect(input('FM')).toHaveValue('0.5');
    expect(input('T1')).toHaveValue('19.9');
    // What was typed on row 2 waits there as a draft.
    expect(screen.getByTestId('entry-row-1')).toHaveAttribute('data-state', 'draft');

    await user.keyboard('{Enter}');
    await waitFor(() => expect(rowTitle()).toHaveTextContent('Row 2 of 4'));
    expect(input('T1')).toHaveValue('20.1');
  });

  it('resumes at the first row without all entries, from the person’s own pass only', async () => {
    const readings = [
      storedReading(0, t1.id, '19.0', 1),
      storedReading(0, fm.id, '0.40', 1),
      storedReading(1, t1.id, '19.5', 1),
    ];
    await openEntry({ readings });
    expect(rowTitle()).toHaveTextContent('Row 2 of 4');
    expect(input('T1')).toHaveValue('19.5');
    expect(input('FM')).toHaveValue('');
    expect(screen.getByTestId('entry-row-0')).toHaveAttribute('data-state', 'saved');
    expect(screen.getByTestId('entry-row-1')).toHaveAttribute('data-state', 'partial');
  });

  it('lets the checker enter pass 2 blind: pass 1 is never requested', async () => {
    const readings = [storedReading(0, t1.id, '19.0', 1), storedReading(0, fm.id, '0.40', 1), storedReading(0, t1.id, '18.8', 2)];
    const { user, network } = await openEntry({ userId: checkerId, readings });
    expect(screen.getByText('Pass 2 (blind)')).toBeInTheDocument();
    // Row 1 holds only the checker's own T1 entry; the reader's values appear nowhere.
    expect(input('T1')).toHaveValue('18.8');
    expect(screen.queryByDisplayValue('19.0')).not.toBeInTheDocument();

    await user.keyboard('{Enter}0.41{Enter}');
    await waitFor(() => expect(saves(network)).toHaveLength(1));
    expect(saves(network)[0].body).toMatchObject({ pass: 2, readings: [{ rawText: '18.8', baseVersion: 1 }, { rawText: '0.41', baseVersion: null }] });

    const readingRequests = network.calls.filter((c) => c.path === `/api/sheets/${sheetId}/readings`);
    expect(readingRequests.length).toBeGreaterThan(0);
    expect(readingRequests.map((c) => c.query.get('pass'))).toEqual(readingRequests.map(() => '2'));
    expect(network.calls.some((c) => c.path.includes('/readings') && c.query.get('pass') === '1')).toBe(false);
    expect(network.calls.some((c) => c.path.includes('/mismatches'))).toBe(false);
  });

  it('keeps a row whose save failed, says it will retry, and offers the stored value on a stale change', async () => {
    let answer: 'down' | 'stale' = 'down';
    const current = storedReading(0, t1.id, '22.2', 1, 2);
    const { user, network } = await openEntry({
      saveRow: () =>
        answer === 'down'
          ? { status: 503, body: { statusCode: 503, message: 'The server is restarting' } }
          : { status: 409, body: { statusCode: 409, message: 'This value was changed elsewhere since you loaded it', current } },
    });
    await user.keyboard('21.0{Enter}0.3{Enter}');
    await waitFor(() => expect(saves(network)).toHaveLength(1));
    await waitFor(() => expect(screen.getByTestId('entry-queue-status')).toHaveTextContent(/1 row waiting — retrying in \d+ s/));
    expect(screen.getByTestId('entry-row-0')).toHaveAttribute('data-state', 'pending');
    // The row waits in the browser's storage meanwhile.
    expect(Object.keys(window.localStorage).filter((k) => k.startsWith('dialsheet.unsent-row.'))).toHaveLength(1);

    answer = 'stale';
    await user.click(screen.getByRole('button', { name: 'Retry now' }));
    await waitFor(() => expect(screen.getByTestId('entry-row-0')).toHaveAttribute('data-state', 'conflict'));
    await user.keyboard('{PageUp}');
    await waitFor(() => expect(rowTitle()).toHaveTextContent('Row 1 of 4'));
    expect(screen.getByText(/was changed elsewhere since you loaded it/)).toBeInTheDocument();
    expect(screen.getByText('“22.2”')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Reload stored value' }));
    await waitFor(() => expect(input('T1')).toHaveValue('22.2'));
  });

  it('sends rows left unsent by an earlier visit, showing them over the server’s values', async () => {
    // The tab was closed (or the server was down) after row 1 was confirmed: it waits in storage.
    const record = {
      key: `${readerId}:${sheetId}:1:0`,
      userId: readerId,
      sheetId,
      pass: 1,
      rowIndex: 0,
      readings: [
        { channelId: t1.id, rawText: '23.25', frameTime: 1, baseVersion: 1 },
        { channelId: fm.id, rawText: '0.61', frameTime: 1, baseVersion: null },
      ],
      seq: 4,
      savedAt: Date.parse(at),
      status: 'pending',
      error: null,
      conflict: null,
    };
    window.localStorage.setItem(`dialsheet.unsent-row.${record.key}`, JSON.stringify(record));
    const { user, network } = await openEntry({ readings: [storedReading(0, t1.id, '23.2', 1)] });

    await waitFor(() => expect(saves(network)).toHaveLength(1));
    expect(saves(network)[0].params.rowIndex).toBe('0');
    expect(saves(network)[0].body).toEqual({ pass: 1, readings: record.readings });
    // Row 1 counts as entered, so the screen resumes on row 2.
    expect(rowTitle()).toHaveTextContent('Row 2 of 4');
    await waitFor(() => expect(window.localStorage.getItem(`dialsheet.unsent-row.${record.key}`)).toBeNull());
    await user.keyboard('{PageUp}');
    await waitFor(() => expect(rowTitle()).toHaveTextContent('Row 1 of 4'));
    expect(input('T1')).toHaveValue('23.25');
    expect(input('FM')).toHaveValue('0.61');
  });

  it('opens the shortcut sheet on ? typed in an entry input, leaving the value untouched', async () => {
    const { user } = await openEntry();
    await user.keyboard('12?');
    const sheet = await findDialog('Keyboard shortcuts');
    expect(input('T1')).toHaveValue('12');
    expect(within(sheet).getByText(/Flag the cell unreadable/)).toBeInTheDocument();
    expect(within(sheet).getByText(/One frame back/)).toBeInTheDocument();
  });

  it('ends the last row in the finish dialog, reached and confirmed by keyboard', async () => {
    let finished: string | null = null;
    let attempts = 0;
    const readings = [0, 1, 2].flatMap((row) => [storedReading(row, t1.id, '20.0', 1), storedReading(row, fm.id, '0.50', 1)]);
    const { user, network } = await openEntry({
      sheet: () => makeSheet({ pass1FinishedAt: finished }),
      readings,
      finishPass: () => {
        attempts += 1;
        if (attempts === 1) {
          return { status: 409, body: { statusCode: 409, message: 'Pass 1 cannot be finished: 2 of 8 cells have no entry yet' } };
        }
        finished = '2026-03-02T10:00:00.000Z';
        return { body: { sheetId, pass: 1, finishedAt: finished } };
      },
    });
    expect(rowTitle()).toHaveTextContent('Row 4 of 4');
    await user.keyboard('20.4{Enter}{Control>}m{/Control}{Enter}');
    const dialog = await findDialog('Finish pass 1');
    await waitFor(() => expect(saves(network)).toHaveLength(1));
    expect((saves(network)[0].body as SaveRowRequest).readings.map((r) => r.rawText)).toEqual(['20.4', '#ambiguous']);
    const finish = within(dialog).getByRole('button', { name: /Finish pass 1/ });
    await waitFor(() => expect(finish).toHaveFocus());

    await user.keyboard('{Enter}');
    expect(await within(dialog).findByText(/2 of 8 cells have no entry yet/)).toBeInTheDocument();
    await user.keyboard('{Enter}');
    expect(await screen.findByText('Pass 1 is finished')).toBeInTheDocument();
    expect(network.callsTo('POST /api/sheets/:sheetId/passes/:pass/finish').map((c) => c.params.pass)).toEqual(['1', '1']);
  });

  it('tells someone who is not the sheet’s reader or checker, and links back to the sheet', async () => {
    renderEntry({ userId: '00000000-0000-4000-8000-0000000000e9' });
    expect(await screen.findByText('This sheet is not yours to enter')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Back to the sheet' })).toHaveAttribute('href', `/campaigns/${campaignId}/sheets/${sheetId}`);
    expect(screen.queryByTestId('entry-screen')).not.toBeInTheDocument();
  });

  it('shows a finished pass as read-only', async () => {
    renderEntry({ sheet: makeSheet({ pass1FinishedAt: at }) });
    expect(await screen.findByText('Pass 1 is finished')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Back to the sheet' })).toBeInTheDocument();
  });
});

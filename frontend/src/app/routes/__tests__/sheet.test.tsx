import { afterEach, describe, expect, it, vi } from 'vitest';
import type { CampaignRole, Reading, ReadingPass, SaveRowRequest, Sheet, SheetMismatches } from '@dialsheet/common';
import { findDialog, fireEvent, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeMember, makeRecording, makeRun, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';
import {
  CHECKER_ID,
  LEAD_ID,
  READER_ID,
  SHEET_CAMPAIGN_ID,
  SHEET_ID,
  SHEET_RUN_ID,
  makeMismatchCell,
  makeMismatches,
  makeReading,
  makeResolution,
  makeRows,
  makeSheet,
  makeSheetChannel,
  makeSheetGridWire,
  passReadings,
} from '@/testing/sheet-fixtures';

const t1 = makeSheetChannel();
const members = [
  makeMember({ userId: LEAD_ID, name: 'Lena Lead', roles: ['lead'] }),
  makeMember({ userId: READER_ID, name: 'Rudi Reader', roles: ['reader'] }),
  makeMember({ userId: CHECKER_ID, name: 'Chris Checker', roles: ['checker'] }),
];

// Six rows of T1. The passes differ on rows 3 and 5 (index 2 and 4); "21.50" and "21.5" agree.
const PASS1 = ['20.1', '20.8', '21.5', '21.50', '22.0', '22.4'];
const PASS2 = ['20.1', '20.8', '21.6', '21.5', '#unreadable', '22.4'];

interface PageOptions {
  userId: string;
  roles: CampaignRole[];
  sheet: Sheet;
  pass1?: Reading[];
  pass2?: Reading[];
  mismatches?: SheetMismatches;
  routes?: StubRoutes;
  tab?: string;
}

/** The sheet page against a stub that refuses, like the server, any pass the blind rule hides. */
function renderSheetPage({ userId, roles, sheet, pass1 = [], pass2 = [], mismatches, routes = {}, tab }: PageOptions) {
  const recording = makeRecording({ runId: SHEET_RUN_ID });
  const run = makeRun({ id: SHEET_RUN_ID, recording, sync: { first: { videoTime: 1, testTime: 0 } } });
  const hidden = (pass: ReadingPass) =>
    (pass === 1 && userId === sheet.checkerId && !sheet.pass2FinishedAt) || (pass === 2 && userId === sheet.readerId && !sheet.pass2FinishedAt);
  return renderApp(`/campaigns/${SHEET_CAMPAIGN_ID}/sheets/${sheet.id}${tab ? `?tab=${tab}` : ''}`, {
    user: makeUser({ id: userId }),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/campaigns/:campaignId/members': { body: members },
      'GET /api/campaigns/:campaignId/channels': { body: [t1] },
      'GET /api/runs/:runId': { body: run },
      'GET /api/sheets/:sheetId': { body: sheet },
      'GET /api/sheets/:sheetId/rows': { body: makeRows(sheet.rowCount) },
      // The table's one answer, with the same blind rules: hidden passes and resolutions are null.
      'GET /api/sheets/:sheetId/grid': () => {
        if (hidden(1) && hidden(2)) return apiError(403, 'The sheet’s entries are shown to its reader and checker, the Lead and Engineers only');
        return {
          body: makeSheetGridWire({
            rows: makeRows(sheet.rowCount),
            channelIds: sheet.channelIds,
            pass1: hidden(1) ? null : pass1,
            pass2: hidden(2) ? null : pass2,
            resolutions: mismatches ? mismatches.cells.flatMap((c) => (c.resolution ? [c.resolution] : [])) : null,
            // Versions and frames come only with the pass the viewer may still change.
            editPass:
              userId === sheet.readerId && !sheet.pass1FinishedAt ? 1 : userId === sheet.checkerId && !sheet.pass2FinishedAt ? 2 : null,
          }),
        };
      },
      'GET /api/sheets/:sheetId/readings': ({ query }: StubRequest) => {
        const pass = Number(query.get('pass')) as ReadingPass;
        if (hidden(pass)) return apiError(403, pass === 1 ? 'Pass 1 is hidden until you finish pass 2' : 'Pass 2 is hidden until the checker finishes it');
        return { body: pass === 1 ? pass1 : pass2 };
      },
      'GET /api/sheets/:sheetId/mismatches': mismatches ? { body: mismatches } : apiError(403, 'The mismatch list opens once pass 2 is finished'),
      'POST /api/recordings/:recordingId/media-urls': {
        body: {
          proxyUrl: `/api/media/${recording.id}/proxy?exp=4102444800&sig=abc`,
          originalUrl: `/api/media/${recording.id}/original?exp=4102444800&sig=abc`,
          posterUrl: null,
          expiresAt: '2099-12-31T23:59:59.000Z',
        },
      },
      'GET /api/recordings/:recordingId/frames': {
        body: { recordingId: recording.id, times: Array.from({ length: 120 }, (_, k) => Number((k / 30).toFixed(6))), keyframeTimes: [0] },
      },
      ...routes,
    },
  });
}

function gridRows(): number[] {
  const cells = within(screen.getByRole('grid')).getAllByRole('gridcell');
  return cells.map((cell) => Number(/row (\d+)/.exec(cell.getAttribute('aria-label') ?? '')?.[1]));
}

afterEach(() => {
  vi.restoreAllMocks();
});

describe('sheet page', () => {
  it('keeps the second pass blind: a checker who has not finished sees pass 2 only and never asks for pass 1 or the mismatches', async () => {
    const sheet = makeSheet({
      pass1FinishedAt: '2026-03-03T10:00:00.000Z',
      progress: { pass1: { done: 6, total: 6 }, pass2: { done: 2, total: 6 } },
    });
    const { network } = renderSheetPage({
      userId: CHECKER_ID,
      roles: ['checker', 'engineer'],
      sheet,
      pass2: passReadings(2, t1.id, PASS2.slice(0, 2)),
    });

    // The first test of the file also waits for the page's code to compile.
    const cell = await screen.findByRole('gridcell', { name: /T1 row 1,/ }, { timeout: 20_000 });
    expect(cell).toHaveAccessibleName('T1 row 1, pass 2 20.1, entered');
    expect(screen.getByRole('gridcell', { name: /T1 row 3,/ })).toHaveAccessibleName('T1 row 3, pass 2 no entry, missing entry');
    expect(screen.getByRole('link', { name: /Enter pass 2/ })).toHaveAttribute('href', `/campaigns/${SHEET_CAMPAIGN_ID}/sheets/${SHEET_ID}/entry`);
    expect(screen.getByText(/Pass 1 stays hidden from you until you finish pass 2/)).toBeInTheDocument();
    expect(screen.queryByRole('tab', { name: 'Mismatches' })).not.toBeInTheDocument();
    expect(screen.getByRole('group', { name: 'Pass 1: 6 of 6 cells entered, finished' })).toBeInTheDocument();

    // One compact answer for the table; pass 1 is never asked for on its own.
    expect(network.callsTo('GET /api/sheets/:sheetId/grid')).toHaveLength(1);
    expect(network.callsTo('GET /api/sheets/:sheetId/readings')).toHaveLength(0);
    expect(network.callsTo('GET /api/sheets/:sheetId/mismatches')).toHaveLength(0);
    expect(network.unhandled).toEqual([]);
  });

  it('draws only the rows in view of a 10 000-row sheet, and marks its first render with data for the benchmark', async () => {
    const mark = vi.spyOn(performance, 'mark');
    const sheet = makeSheet({ rowCount: 10_000, endTime: 19_998, pass2FinishedAt: '2026-03-03T11:00:00.000Z' });
    const texts = Array.from({ length: 10_000 }, (_, i) => (20 + (i % 100) / 10).toFixed(1));
    const { user } = renderSheetPage({
      userId: LEAD_ID,
      roles: ['lead'],
      sheet,
      pass1: passReadings(1, t1.id, texts),
      pass2: passReadings(2, t1.id, texts),
      mismatches: makeMismatches([]),
    });
    await screen.findByRole('gridcell', { name: /T1 row 1,/ });
    expect(screen.getByText('10 000 rows')).toBeInTheDocument();
    expect(screen.getByRole('gridcell', { name: /T1 row 1,/ })).toHaveAccessibleName('T1 row 1, pass 1 20.0, pass 2 20.0, passes agree');
    const drawn = gridRows();
    expect(drawn.length).toBeGreaterThan(5);
    expect(drawn.length).toBeLessThan(60);
    const calls = mark.mock.calls.filter(([name]) => name === 'dialsheet:sheet-table-rendered');
    expect(calls).toEqual([['dialsheet:sheet-table-rendered', { detail: { rows: 10_000 } }]]);

    // The keyboard reaches the last row. (Scrolling it into view needs a real layout; jsdom has none.)
    const grid = screen.getByRole('grid');
    grid.focus();
    await user.keyboard('{Control>}{End}{/Control}');
    await waitFor(() => expect(grid).toHaveAttribute('aria-activedescendant', 'sheet-cell-9999-0'));
    await user.keyboard('{ArrowUp}{ArrowUp}');
    expect(grid).toHaveAttribute('aria-activedescendant', 'sheet-cell-9997-0');
  });

  it('filters the table to the mismatched rows, coloured by how the passes compare', async () => {
    const sheet = makeSheet({ pass1FinishedAt: '2026-03-03T10:00:00.000Z', pass2FinishedAt: '2026-03-03T11:00:00.000Z' });
    const p1 = passReadings(1, t1.id, PASS1);
    const p2 = passReadings(2, t1.id, PASS2);
    const { user } = renderSheetPage({
      userId: LEAD_ID,
      roles: ['lead'],
      sheet,
      pass1: p1,
      pass2: p2,
      mismatches: makeMismatches([makeMismatchCell(p1[2], p2[2]), makeMismatchCell(p1[4], p2[4])]),
    });

    await screen.findByRole('gridcell', { name: /T1 row 6,/ });
    expect(gridRows()).toEqual([1, 2, 3, 4, 5, 6]);
    expect(screen.getByRole('gridcell', { name: /T1 row 3,/ })).toHaveAttribute('data-state', 'mismatch');
    expect(screen.getByRole('gridcell', { name: /T1 row 4,/ })).toHaveAttribute('data-state', 'agree');
    expect(screen.getByRole('gridcell', { name: /T1 row 5,/ })).toHaveAttribute('data-state', 'flagged');

    await user.click(screen.getByRole('radio', { name: 'Mismatched' }));
    await waitFor(() => expect(gridRows()).toEqual([3, 5]));
    expect(screen.getByText('2 of 6 rows')).toBeInTheDocument();

    await user.click(screen.getByRole('radio', { name: 'Flagged' }));
    await waitFor(() => expect(gridRows()).toEqual([5]));
  });

  it('lets the reader change their own entry in the table, sending the version it replaces', async () => {
    const sheet = makeSheet({ progress: { pass1: { done: 6, total: 6 }, pass2: { done: 0, total: 6 } } });
    const p1 = passReadings(1, t1.id, PASS1).map((r) => (r.rowIndex === 1 ? { ...r, version: 3, frameTime: 2.533333 } : r));
    const saved: SaveRowRequest[] = [];
    const { user, network } = renderSheetPage({
      userId: READER_ID,
      roles: ['reader'],
      sheet,
      pass1: p1,
      routes: {
        'PUT /api/sheets/:sheetId/rows/:rowIndex': ({ body, params }: StubRequest) => {
          const request = body as SaveRowRequest;
          saved.push(request);
          const input = request.readings[0];
          return { body: { readings: [makeReading({ ...p1[Number(params.rowIndex)], rawText: input.rawText, value: Number(input.rawText), version: 4 })] } };
        },
      },
    });

    const cell = await screen.findByRole('gridcell', { name: /T1 row 2,/ });
    fireEvent.mouseDown(cell);
    await user.keyboard('{Enter}');
    const editor = await screen.findByRole('textbox', { name: 'Pass 1 entry, T1 row 2' });
    expect(editor).toHaveValue('20.8');
    await user.clear(editor);
    await user.type(editor, '20,9{Enter}');
    // A value the campaign's rules cannot read is stopped here, with the reason, and nothing is sent.
    expect(await screen.findByRole('alert')).toHaveTextContent("Use '.' as the decimal separator in this campaign");
    expect(saved).toHaveLength(0);

    await user.clear(editor);
    await user.type(editor, '20.9{Enter}');
    await waitFor(() => expect(saved).toHaveLength(1));
    expect(network.callsTo('PUT /api/sheets/:sheetId/rows/:rowIndex')[0].path).toBe(`/api/sheets/${SHEET_ID}/rows/1`);
    expect(saved[0]).toEqual({ pass: 1, readings: [{ channelId: t1.id, rawText: '20.9', frameTime: 2.533333, baseVersion: 3 }] });
    await waitFor(() => expect(screen.getByRole('gridcell', { name: /T1 row 2,/ })).toHaveAccessibleName('T1 row 2, pass 1 20.9, entered'));
    // Saved: the cursor goes on to the next row, ready for the next change.
    expect(screen.getByRole('grid')).toHaveAttribute('aria-activedescendant', 'sheet-cell-2-0');
    // The saved reading went into the table's data in place: the sheet was not fetched again.
    expect(network.callsTo('GET /api/sheets/:sheetId/grid')).toHaveLength(1);
    expect(network.callsTo('GET /api/sheets/:sheetId/readings')).toHaveLength(0);
  });

  it('offers to reload a cell that changed meanwhile, instead of overwriting it', async () => {
    const sheet = makeSheet();
    const p1 = passReadings(1, t1.id, PASS1);
    const newer = { ...p1[0], rawText: '20.2', value: 20.2, version: 2 };
    const { user } = renderSheetPage({
      userId: READER_ID,
      roles: ['reader'],
      sheet,
      pass1: p1,
      routes: {
        'PUT /api/sheets/:sheetId/rows/:rowIndex': {
          status: 409,
          body: { statusCode: 409, message: 'This entry was changed since you loaded it; reload it and try again', current: newer },
        },
      },
    });
    const cell = await screen.findByRole('gridcell', { name: /T1 row 1,/ });
    await user.dblClick(cell);
    const editor = await screen.findByRole('textbox', { name: 'Pass 1 entry, T1 row 1' });
    await user.clear(editor);
    await user.type(editor, '20.3{Enter}');

    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent('This entry was changed since you loaded it');
    await user.click(within(alert).getByRole('button', { name: 'Reload the stored value' }));
    await waitFor(() => expect(screen.getByRole('gridcell', { name: /T1 row 1,/ })).toHaveAccessibleName('T1 row 1, pass 1 20.2, entered'));
  });

  it('walks the checker through the mismatches with the keyboard and records a resolution with its reason', async () => {
    const sheet = makeSheet({ pass1FinishedAt: '2026-03-03T10:00:00.000Z', pass2FinishedAt: '2026-03-03T11:00:00.000Z' });
    const p1 = passReadings(1, t1.id, PASS1);
    const p2 = passReadings(2, t1.id, PASS2);
    const resolved = makeMismatchCell(p1[4], p2[4], makeResolution({ rowIndex: 4, channelId: t1.id, rawText: '22.0' }));
    const { user, network } = renderSheetPage({
      userId: CHECKER_ID,
      roles: ['checker'],
      sheet,
      pass1: p1,
      pass2: p2,
      tab: 'mismatches',
      mismatches: makeMismatches([makeMismatchCell(p1[2], p2[2]), resolved]),
      routes: {
        'PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId': ({ body, params }: StubRequest) => ({
          body: makeResolution({ rowIndex: Number(params.rowIndex), channelId: params.channelId, ...(body as { rawText: string; reason: string }) }),
        }),
      },
    });

    // Open mismatches only: the resolved one is under "All".
    const table = (await screen.findByText('21.6')).closest('table')!;
    expect(within(table).queryByText('22.0')).not.toBeInTheDocument();
    await user.keyboard('j');
    await user.keyboard('{Enter}');
    const drawer = await screen.findByRole('dialog');
    expect(drawer).toHaveTextContent('Row 3 · 00:04.000 · T1');
    expect(within(drawer).getByRole('region', { name: 'Pass 1 entry' })).toHaveTextContent('read at frame 00:04.500');
    expect(within(drawer).getByRole('region', { name: 'Pass 2 entry' })).toHaveTextContent('21.6');
    expect(within(drawer).getByRole('region', { name: 'Video' })).toBeInTheDocument();

    await user.keyboard('2');
    const value = within(drawer).getByLabelText('Resolved value');
    expect(value).toHaveValue('21.6');
    await user.clear(value);
    await user.type(value, '21.5x');
    // Parsed as it is typed, by the same rules as an entry.
    expect(within(drawer).getByText("Not a number: letters are not allowed (only 'e' for an exponent, as in 1.5e3)")).toBeInTheDocument();
    await user.type(value, '{Backspace}');
    expect(within(drawer).getByText('= 21.5 °C')).toBeInTheDocument();
    await user.keyboard('{Control>}{Enter}{/Control}');
    expect(await within(drawer).findByText(/Say why this is the value/)).toBeInTheDocument();
    expect(network.callsTo('PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId')).toHaveLength(0);

    await user.type(within(drawer).getByLabelText('Reason'), 'Frame 00:04.500 shows 21.5; pass 2 caught the digit changing');
    await user.keyboard('{Control>}{Enter}{/Control}');

    await waitFor(() => expect(network.callsTo('PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId')).toHaveLength(1));
    const put = network.callsTo('PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId')[0];
    expect(put.path).toBe(`/api/sheets/${SHEET_ID}/resolutions/2/${t1.id}`);
    expect(put.body).toEqual({ rawText: '21.5', reason: 'Frame 00:04.500 shows 21.5; pass 2 caught the digit changing' });
    expect(await within(drawer).findByText('Resolution saved (version 1)')).toBeInTheDocument();
  });

  it('shows a resolution saved meanwhile by someone else and offers to load it', async () => {
    const sheet = makeSheet({ pass1FinishedAt: '2026-03-03T10:00:00.000Z', pass2FinishedAt: '2026-03-03T11:00:00.000Z' });
    const p1 = passReadings(1, t1.id, PASS1);
    const p2 = passReadings(2, t1.id, PASS2);
    const theirs = makeResolution({ rowIndex: 2, channelId: t1.id, rawText: '21.6', reason: 'Lead checked the frame', resolvedBy: LEAD_ID, version: 1 });
    const { user, network } = renderSheetPage({
      userId: CHECKER_ID,
      roles: ['checker'],
      sheet,
      pass1: p1,
      pass2: p2,
      tab: 'mismatches',
      mismatches: makeMismatches([makeMismatchCell(p1[2], p2[2])]),
      routes: {
        'PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId': {
          status: 409,
          body: { statusCode: 409, message: 'This cell was resolved since you opened it', current: theirs },
        },
      },
    });
    await user.click(await screen.findByText('21.6'));
    await user.keyboard('{Enter}');
    const drawer = await screen.findByRole('dialog');
    await user.type(within(drawer).getByLabelText('Resolved value'), '21.5');
    await user.type(within(drawer).getByLabelText('Reason'), 'Settled digit');
    await user.click(within(drawer).getByRole('button', { name: 'Save resolution' }));

    const alert = await within(drawer).findByRole('alert');
    expect(alert).toHaveTextContent('This cell was resolved since you opened it');
    expect(alert).toHaveTextContent('Lead checked the frame');
    expect(alert).toHaveTextContent('Lena Lead');
    await user.click(within(alert).getByRole('button', { name: 'Load the stored resolution' }));
    expect(within(drawer).getByLabelText('Resolved value')).toHaveValue('21.6');

    // (The name is matched loosely: jsdom never ends the button's fading loading icon.)
    await user.click(within(drawer).getByRole('button', { name: /Save changed resolution/ }));
    await waitFor(() => expect(network.callsTo('PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId')).toHaveLength(2));
    expect(network.callsTo('PUT /api/sheets/:sheetId/resolutions/:rowIndex/:channelId')[1].body).toEqual({
      rawText: '21.6',
      reason: 'Lead checked the frame',
      baseVersion: 1,
    });
  });

  it('shows the mismatch rates per channel and per person, and lists the page’s keys on ?', async () => {
    const sheet = makeSheet({ pass1FinishedAt: '2026-03-03T10:00:00.000Z', pass2FinishedAt: '2026-03-03T11:00:00.000Z' });
    const { user } = renderSheetPage({
      userId: LEAD_ID,
      roles: ['lead'],
      sheet,
      tab: 'rates',
      mismatches: makeMismatches([], {
        byChannel: [{ channelId: t1.id, compared: 6, mismatches: 2, rate: 2 / 6 }],
        byPerson: [
          { userId: READER_ID, name: 'Rudi Reader', pass: 1, compared: 6, mismatches: 2, rate: 2 / 6, wrong: 1 },
          { userId: CHECKER_ID, name: 'Chris Checker', pass: 2, compared: 6, mismatches: 2, rate: 2 / 6, wrong: 0 },
        ],
      }),
    });
    const perChannel = await screen.findByRole('table', { name: 'Mismatch rate per channel' });
    const t1Row = within(perChannel).getByText('T1').closest('tr')!;
    expect(t1Row).toHaveTextContent('6233.3 %');
    const perPerson = screen.getByRole('table', { name: 'Mismatch rate per person' });
    const readerRow = within(perPerson).getByText('Rudi Reader').closest('tr')!;
    expect(readerRow).toHaveTextContent('16233.3 %1');

    await user.keyboard('m');
    await screen.findByRole('tab', { name: 'Mismatches', selected: true });
    await user.keyboard('?');
    const sheetDialog = await findDialog('Keyboard shortcuts');
    expect(within(sheetDialog).getAllByText('Next mismatch')).toHaveLength(2); // j and ↓
    expect(within(sheetDialog).getByText('Show the mismatch rates')).toBeInTheDocument();
  });
});

import { describe, expect, it } from 'vitest';
import type { CampaignRole, CreateSheetRequest, Sheet } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeMember, makeProbe, makeRecording, makeRun, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';
import { CHECKER_ID, LEAD_ID, READER_ID, SHEET_CAMPAIGN_ID, SHEET_RUN_ID, makeSheet, makeSheetChannel } from '@/testing/sheet-fixtures';

const t1 = makeSheetChannel();
const t2 = makeSheetChannel({ id: '50000000-0000-4000-8000-000000000002', symbol: 'T2', name: 'Warm stream outlet temperature', position: 1 });
const v1 = makeSheetChannel({ id: '50000000-0000-4000-8000-000000000003', symbol: 'V1', name: 'Flow meter output', rawUnit: 'V', position: 2 });

const lead = makeMember({ userId: LEAD_ID, name: 'Lena Lead', email: 'lena.lead@example.org', roles: ['lead'] });
const reader = makeMember({ userId: READER_ID, name: 'Rudi Reader', email: 'rudi.reader@example.org', roles: ['reader'] });
const checker = makeMember({ userId: CHECKER_ID, name: 'Chris Checker', email: 'chris.checker@example.org', roles: ['checker'] });

function renderRunPage(roles: CampaignRole[], sheets: Sheet[], routes: StubRoutes = {}) {
  // Two minutes of video, test clock started 10 s into it: the recording ends at 110 s test time.
  const recording = makeRecording({ runId: SHEET_RUN_ID, probe: makeProbe({ durationSec: 120 }) });
  const run = makeRun({ id: SHEET_RUN_ID, recording, sync: { first: { videoTime: 10, testTime: 0 } } });
  return renderApp(`/campaigns/${SHEET_CAMPAIGN_ID}/runs/${SHEET_RUN_ID}`, {
    user: makeUser({ id: LEAD_ID }),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/campaigns/:campaignId/members': { body: [lead, reader, checker] },
      'GET /api/runs/:runId': { body: run },
      'GET /api/runs/:runId/recording': { body: recording },
      'GET /api/campaigns/:campaignId/channels': { body: [t1, t2, v1] },
      'GET /api/runs/:runId/display-regions': { body: [] },
      'GET /api/runs/:runId/sheets': { body: sheets },
      'POST /api/recordings/:recordingId/media-urls': {
        body: {
          proxyUrl: `/api/media/${recording.id}/proxy?exp=4102444800&sig=abc`,
          originalUrl: `/api/media/${recording.id}/original?exp=4102444800&sig=abc`,
          posterUrl: null,
          expiresAt: '2099-12-31T23:59:59.000Z',
        },
      },
      'GET /api/recordings/:recordingId/frames': {
        body: { recordingId: recording.id, times: Array.from({ length: 30 }, (_, k) => Number((k / 30).toFixed(6))), keyframeTimes: [0] },
      },
      ...routes,
    },
  });
}

async function openNewSheet(user: ReturnType<typeof renderRunPage>['user']) {
  await user.click(await screen.findByRole('button', { name: /New sheet/ }));
  return findDialog('New sheet');
}

describe('sheets on the run page', () => {
  it('lists the run’s sheets with their plan, people and progress per pass; a reader gets no planning controls', async () => {
    const sheet = makeSheet({
      rowCount: 301,
      endTime: 600,
      channelIds: [t1.id, t2.id],
      progress: { pass1: { done: 602, total: 602 }, pass2: { done: 120, total: 602 } },
      pass1FinishedAt: '2026-03-03T10:00:00.000Z',
    });
    const { network } = renderRunPage(['reader'], [sheet]);

    const link = await screen.findByRole('link', { name: 'Warm-up, every 2 s' });
    expect(link).toHaveAttribute('href', `/campaigns/${SHEET_CAMPAIGN_ID}/sheets/${sheet.id}`);
    const row = link.closest('tr')!;
    expect(row).toHaveTextContent('301 rows × 2 channels');
    expect(row).toHaveTextContent('every 2 s, 00:00.000 – 10:00.000');
    expect(row).toHaveTextContent('Rudi Reader');
    expect(row).toHaveTextContent('Chris Checker');
    expect(within(row).getByRole('group', { name: 'Pass 1: 602 of 602 cells entered, finished' })).toBeInTheDocument();
    expect(within(row).getByRole('group', { name: 'Pass 2: 120 of 602 cells entered' })).toBeInTheDocument();
    expect(within(row).getByText('open')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /New sheet/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: `Assign ${sheet.name}` })).not.toBeInTheDocument();
    expect(network.unhandled).toEqual([]);
  });

  it('plans a sheet: the body carries test times in seconds, the interval and the channels in the chosen order', async () => {
    const created = makeSheet({ name: 'Steady state, every 5 s' });
    const { user, network } = renderRunPage(['engineer'], [], {
      'POST /api/runs/:runId/sheets': () => ({ status: 201, body: created }),
    });
    expect(await screen.findByText('No sheets yet')).toBeInTheDocument();
    const dialog = await openNewSheet(user);

    // The end is filled in from the recording's length in test time.
    expect(within(dialog).getByLabelText('End (test time)')).toHaveValue('01:50.000');
    await user.type(within(dialog).getByLabelText('Name'), 'Steady state, every 5 s');
    const start = within(dialog).getByLabelText('Start (test time)');
    await user.clear(start);
    await user.type(start, '00:30');
    const end = within(dialog).getByLabelText('End (test time)');
    await user.clear(end);
    await user.type(end, '90.5');
    await user.click(within(dialog).getByRole('radio', { name: '5 s' }));
    await user.click(within(dialog).getByRole('button', { name: 'Remove T2' }));
    await user.click(within(dialog).getByRole('button', { name: 'Move V1 up' }));
    expect(within(dialog).getByTestId('sheet-plan-summary')).toHaveTextContent('13 rows × 2 channels = 26 cells');

    await user.click(within(dialog).getByRole('button', { name: 'Create sheet' }));

    await waitFor(() => expect(network.callsTo('POST /api/runs/:runId/sheets')).toHaveLength(1));
    const body = network.callsTo('POST /api/runs/:runId/sheets')[0].body as CreateSheetRequest;
    expect(body).toEqual({ name: 'Steady state, every 5 s', startTime: 30, endTime: 90.5, interval: 5, channelIds: [v1.id, t1.id] });
    await waitFor(() => expect(screen.queryByRole('dialog')).not.toBeInTheDocument());
    expect(network.unhandled).toEqual([]);
  });

  it('refuses a plan it can see is wrong, and shows the server’s messages beside the fields they name', async () => {
    const { user, network } = renderRunPage(['lead'], [], {
      'POST /api/runs/:runId/sheets': {
        status: 400,
        body: {
          statusCode: 400,
          error: 'Bad Request',
          message: ['interval: a sheet from 0 s to 100 s every 0.1 s would have 1001 rows (at most 1000); use a longer interval', 'Something else went wrong'],
        },
      },
    });
    const dialog = await openNewSheet(user);
    await user.type(within(dialog).getByLabelText('Name'), 'Fast');
    const end = within(dialog).getByLabelText('End (test time)');
    await user.clear(end);
    await user.type(end, '200');
    await user.click(within(dialog).getByRole('button', { name: 'Create sheet' }));
    expect(await within(dialog).findByText('The recording ends at 01:50.000 test time; end there or earlier')).toBeInTheDocument();
    expect(network.callsTo('POST /api/runs/:runId/sheets')).toHaveLength(0);

    await user.clear(end);
    await user.type(end, '100');
    const interval = within(dialog).getByLabelText('Interval in seconds');
    await user.clear(interval);
    await user.type(interval, '0.1');
    await user.click(within(dialog).getByRole('button', { name: 'Create sheet' }));

    await waitFor(() => expect(network.callsTo('POST /api/runs/:runId/sheets')).toHaveLength(1));
    expect(await within(dialog).findByText(/interval: a sheet from 0 s to 100 s every 0.1 s would have 1001 rows/)).toBeInTheDocument();
    expect(within(dialog).getByRole('alert')).toHaveTextContent('Something else went wrong');
    // Nothing typed is lost: the form is still open with the values in it.
    expect(within(dialog).getByLabelText('Name')).toHaveValue('Fast');
  });

  it('assigns a reader and a checker chosen from members holding those roles', async () => {
    const sheet = makeSheet({ readerId: null, checkerId: null, status: 'draft' });
    const { user, network } = renderRunPage(['lead'], [sheet], {
      'PUT /api/sheets/:sheetId/assignment': ({ body }: StubRequest) => ({ body: { ...sheet, ...(body as object), status: 'open' } }),
    });
    await user.click(await screen.findByRole('button', { name: `Assign ${sheet.name}` }));
    const dialog = await findDialog(`Assign ${sheet.name}`);

    await user.click(within(dialog).getByLabelText('Reader (pass 1)'));
    const readerOption = await waitFor(() => {
      const found = document.querySelector<HTMLElement>('.ant-select-item-option[title^="Rudi Reader"]');
      if (!found) throw new Error('no reader option yet');
      return found;
    });
    // Only members with the reader role are offered for pass 1.
    expect(document.querySelector('.ant-select-item-option[title^="Chris Checker"]')).toBeNull();
    await user.click(readerOption);
    await user.click(within(dialog).getByLabelText('Checker (pass 2, blind)'));
    await user.click(
      await waitFor(() => {
        const found = document.querySelector<HTMLElement>('.ant-select-item-option[title^="Chris Checker"]');
        if (!found) throw new Error('no checker option yet');
        return found;
      }),
    );
    await user.click(within(dialog).getByRole('button', { name: 'Save assignment' }));

    await waitFor(() => expect(network.callsTo('PUT /api/sheets/:sheetId/assignment')).toHaveLength(1));
    expect(network.callsTo('PUT /api/sheets/:sheetId/assignment')[0].body).toEqual({ readerId: READER_ID, checkerId: CHECKER_ID });
  });

  it('shows why a sheet that holds readings is not deleted', async () => {
    const sheet = makeSheet({ progress: { pass1: { done: 3, total: 6 }, pass2: { done: 0, total: 6 } } });
    const { user, network } = renderRunPage(['lead'], [sheet], {
      'DELETE /api/sheets/:sheetId': apiError(409, 'This sheet holds 3 readings; readings are never deleted, so neither is the sheet'),
    });
    await user.click(await screen.findByRole('button', { name: `Delete ${sheet.name}` }));
    await user.click(await screen.findByRole('button', { name: 'Delete sheet' }));

    await waitFor(() => expect(network.callsTo('DELETE /api/sheets/:sheetId')).toHaveLength(1));
    const alert = await screen.findByRole('alert');
    expect(alert).toHaveTextContent(`${sheet.name} was not deleted`);
    expect(alert).toHaveTextContent('This sheet holds 3 readings; readings are never deleted, so neither is the sheet');
    expect(screen.getByRole('link', { name: sheet.name })).toBeInTheDocument();
  });
});

import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { CampaignRole, CreateReleaseRequest, Release } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeRun, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';
import {
  ENGINEER,
  HASH,
  RELEASE_CAMPAIGN_ID,
  RUN_A_ID,
  RUN_B_ID,
  RUN_C_ID,
  makeDashboard,
  makeDashboardRun,
  makeDashboardSheet,
  makeRelease,
} from '@/features/releases/testing/release-fixtures';

const published = makeRelease({ runIds: [RUN_C_ID] });
const requested = makeRelease({
  id: '80000000-0000-4000-8000-000000000002',
  number: null,
  status: 'requested',
  title: 'Cool stream runs',
  note: 'Please sign',
  runIds: [RUN_A_ID],
  requestedBy: ENGINEER,
  signedBy: null,
  signedAt: null,
  contentHash: null,
  readingCount: null,
});

const runs = [
  makeRun({ id: RUN_A_ID, name: 'Run 1, meter on warm stream' }),
  makeRun({ id: RUN_B_ID, name: 'Run 2, meter on cool stream' }),
  makeRun({ id: RUN_C_ID, name: 'Run 3, repeat' }),
];

const dashboard = makeDashboard({
  runs: [
    makeDashboardRun(),
    makeDashboardRun({
      id: RUN_B_ID,
      name: 'Run 2, meter on cool stream',
      readyToRelease: false,
      sheets: [makeDashboardSheet({ id: '60000000-0000-4000-8000-000000000002', runId: RUN_B_ID, name: 'Steady', pass2Finished: false, openMismatches: 2 })],
    }),
    makeDashboardRun({ id: RUN_C_ID, name: 'Run 3, repeat', lockedBy: { releaseId: published.id, number: 1 } }),
  ],
});

function renderReleases(roles: CampaignRole[], routes: StubRoutes = {}) {
  return renderApp(`/campaigns/${RELEASE_CAMPAIGN_ID}/releases`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/campaigns/:campaignId/runs': { body: runs },
      'GET /api/campaigns/:campaignId/releases': { body: [published, requested] },
      'GET /api/campaigns/:campaignId/dashboard': { body: dashboard },
      ...routes,
    },
  });
}

describe('releases page', () => {
  it('lists releases with number, status, short hash, signer and runs', async () => {
    renderReleases(['reader']);
    // The first render compiles the lazily loaded page: give it room on a busy machine.
    const table = await screen.findByRole('table', { name: 'Releases' }, { timeout: 20_000 });
    const row = within(table).getByText('Release 1').closest('tr')!;
    expect(row).toHaveTextContent('published');
    expect(row).toHaveTextContent('Run 3, repeat');
    expect(row).toHaveTextContent('Lena Lead');
    // The first 12 hex digits on screen; the full hash is what the copy button copies.
    expect(within(row).getByText(HASH.slice(0, 12))).toBeInTheDocument();
    expect(row).not.toHaveTextContent(HASH);
    const requestRow = within(table).getByText('Cool stream runs').closest('tr')!;
    expect(requestRow).toHaveTextContent('waiting for sign-off');
    expect(requestRow).toHaveTextContent('requested by Erik Engineer');
  });

  it('keeps a reader read-only: no request, sign, decline, correction or draft export, and no dashboard call', async () => {
    const { network } = renderReleases(['reader']);
    await screen.findByRole('table', { name: 'Releases' });
    expect(screen.queryByRole('button', { name: 'Request release' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Release' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Sign Cool stream runs' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Decline Cool stream runs' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Draft export/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('table', { name: 'Locked runs' })).not.toBeInTheDocument();
    // A signed release may still be exported and read as a report.
    expect(screen.getByRole('button', { name: 'Export release 1 as CSV long' })).toBeInTheDocument();
    expect(screen.getByRole('button', { name: 'Report of release 1' })).toBeInTheDocument();
    expect(network.callsTo('GET /api/campaigns/:campaignId/dashboard')).toHaveLength(0);
  });

  it('lets an engineer request a release of ready runs only; others are disabled with the reason', async () => {
    const created = makeRelease({ ...requested, id: '80000000-0000-4000-8000-000000000003', title: 'Warm runs' });
    const { user, network } = renderReleases(['engineer'], {
      'POST /api/campaigns/:campaignId/releases': () => ({ status: 201, body: created }),
    });
    await screen.findByRole('table', { name: 'Releases' });
    expect(screen.queryByRole('button', { name: 'Sign Cool stream runs' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Decline Cool stream runs' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Open correction of Run 3, repeat' })).not.toBeInTheDocument();

    await user.click(await screen.findByRole('button', { name: 'Request release' }));
    const dialog = await findDialog('Request release');
    expect(within(dialog).getByRole('checkbox', { name: 'Include Run 2, meter on cool stream' })).toBeDisabled();
    expect(within(dialog).getByText('Steady: pass 2 not finished; Steady: 2 open mismatches')).toBeInTheDocument();
    expect(within(dialog).getByRole('checkbox', { name: 'Include Run 3, repeat' })).toBeDisabled();
    expect(within(dialog).getByText(/In release 1; open a correction/)).toBeInTheDocument();

    // No runs chosen: nothing is sent.
    await user.type(within(dialog).getByLabelText('Title'), 'Warm runs');
    await user.click(within(dialog).getByRole('button', { name: 'Send request' }));
    expect(await within(dialog).findByText('Choose at least one ready run.')).toBeInTheDocument();
    expect(network.callsTo('POST /api/campaigns/:campaignId/releases')).toHaveLength(0);

    await user.click(within(dialog).getByRole('checkbox', { name: 'Include Run 1, meter on warm stream' }));
    await user.click(within(dialog).getByRole('button', { name: 'Send request' }));
    await waitFor(() => expect(network.callsTo('POST /api/campaigns/:campaignId/releases')).toHaveLength(1));
    const body = network.callsTo('POST /api/campaigns/:campaignId/releases')[0].body as CreateReleaseRequest;
    expect(body).toEqual({ title: 'Warm runs', runIds: [RUN_A_ID] });
    expect(await screen.findByText('Request sent; a lead will review it')).toBeInTheDocument();
  });

  it('lets a lead release at once (sign: true) and shows a refusal inside the dialog', async () => {
    let attempt = 0;
    const { user, network } = renderReleases(['lead'], {
      'POST /api/campaigns/:campaignId/releases': () =>
        ++attempt === 1 ? apiError(409, 'Run 1 has 1 open mismatch (sheet Warm-up, row 12, T1)') : { status: 201, body: makeRelease({ number: 2, runIds: [RUN_A_ID] }) },
    });
    await screen.findByRole('table', { name: 'Releases' });
    await user.click(await screen.findByRole('button', { name: 'Release' }));
    const dialog = await findDialog('Release');
    expect(within(dialog).getByText('Signing locks the chosen runs')).toBeInTheDocument();
    await user.type(within(dialog).getByLabelText('Title'), 'Warm runs');
    await user.click(within(dialog).getByRole('checkbox', { name: 'Include Run 1, meter on warm stream' }));
    await user.click(within(dialog).getByRole('button', { name: 'Sign and publish' }));
    expect(await within(dialog).findByText('Run 1 has 1 open mismatch (sheet Warm-up, row 12, T1)')).toBeInTheDocument();
    // Nothing typed is lost after a refusal.
    expect(within(dialog).getByLabelText('Title')).toHaveValue('Warm runs');
    await user.click(within(dialog).getByRole('button', { name: 'Sign and publish' }));
    await waitFor(() => expect(network.callsTo('POST /api/campaigns/:campaignId/releases')).toHaveLength(2));
    expect(network.callsTo('POST /api/campaigns/:campaignId/releases')[1].body).toEqual({ title: 'Warm runs', runIds: [RUN_A_ID], sign: true });
    expect(await screen.findByText('Release 2 is signed and published')).toBeInTheDocument();
  });

  it('lets a lead sign a request (with the edited note) or decline it with a reason', async () => {
    const { user, network } = renderReleases(['lead'], {
      'POST /api/releases/:releaseId/sign': ({ params }: StubRequest) => ({ body: { ...requested, id: params.releaseId, status: 'published', number: 2 } satisfies Release }),
      'POST /api/releases/:releaseId/decline': ({ params }: StubRequest) => ({ body: { ...requested, id: params.releaseId, status: 'declined' } satisfies Release }),
    });
    await user.click(await screen.findByRole('button', { name: 'Sign Cool stream runs' }));
    const sign = await findDialog('Sign “Cool stream runs”');
    const note = within(sign).getByLabelText('Note');
    expect(note).toHaveValue('Please sign');
    await user.clear(note);
    await user.type(note, 'Checked against the frames');
    await user.click(within(sign).getByRole('button', { name: 'Sign and publish' }));
    await waitFor(() => expect(network.callsTo('POST /api/releases/:releaseId/sign')).toHaveLength(1));
    expect(network.callsTo('POST /api/releases/:releaseId/sign')[0]).toMatchObject({ path: `/api/releases/${requested.id}/sign`, body: { note: 'Checked against the frames' } });

    await user.click(screen.getByRole('button', { name: 'Decline Cool stream runs' }));
    const decline = await findDialog('Decline “Cool stream runs”');
    await user.click(within(decline).getByRole('button', { name: 'Decline request' }));
    expect(await within(decline).findByText('Say why, so the engineer knows what to change.')).toBeInTheDocument();
    expect(network.callsTo('POST /api/releases/:releaseId/decline')).toHaveLength(0);
    await user.type(within(decline).getByLabelText('Reason'), 'Run 1 needs the T3 misread fixed');
    await user.click(within(decline).getByRole('button', { name: 'Decline request' }));
    await waitFor(() => expect(network.callsTo('POST /api/releases/:releaseId/decline')).toHaveLength(1));
    expect(network.callsTo('POST /api/releases/:releaseId/decline')[0].body).toEqual({ reason: 'Run 1 needs the T3 misread fixed' });
  });

  it('opens a correction on a locked run only with a reason, after saying the release stays as it was', async () => {
    const { user, network } = renderReleases(['lead'], { 'POST /api/runs/:runId/correction': { status: 204 } });
    const locked = await screen.findByRole('table', { name: 'Locked runs' });
    await user.click(within(locked).getByRole('button', { name: 'Open correction of Run 3, repeat' }));
    const dialog = await findDialog('Open a correction of Run 3, repeat');
    expect(within(dialog).getByText('Release 1 stays exactly as it was signed')).toBeInTheDocument();
    expect(dialog).toHaveTextContent('the next release that holds the run is a new version that supersedes release 1');

    await user.click(within(dialog).getByRole('button', { name: 'Open correction' }));
    expect(await within(dialog).findByText('A reason is required; it is kept in the audit trail.')).toBeInTheDocument();
    // Blank is not a reason either.
    await user.type(within(dialog).getByLabelText('Reason for the correction'), '   ');
    await user.click(within(dialog).getByRole('button', { name: 'Open correction' }));
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(network.callsTo('POST /api/runs/:runId/correction')).toHaveLength(0);

    await user.clear(within(dialog).getByLabelText('Reason for the correction'));
    await user.type(within(dialog).getByLabelText('Reason for the correction'), 'T3 misread at 04:10');
    await user.click(within(dialog).getByRole('button', { name: 'Open correction' }));
    await waitFor(() => expect(network.callsTo('POST /api/runs/:runId/correction')).toHaveLength(1));
    expect(network.callsTo('POST /api/runs/:runId/correction')[0]).toMatchObject({ path: `/api/runs/${RUN_C_ID}/correction`, body: { reason: 'T3 misread at 04:10' } });
  });

  describe('exports', () => {
    let saved: Array<{ href: string; download: string }>;
    beforeEach(() => {
      saved = [];
      vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
        saved.push({ href: this.href, download: this.download });
      });
      Object.defineProperty(URL, 'createObjectURL', { configurable: true, writable: true, value: vi.fn(() => 'blob:test-export') });
      Object.defineProperty(URL, 'revokeObjectURL', { configurable: true, writable: true, value: vi.fn() });
    });
    afterEach(() => vi.restoreAllMocks());

    it('downloads a release in the chosen format with the bearer token and saves it', async () => {
      const { user, network } = renderReleases(['reader'], {
        'GET /api/releases/:releaseId/export': { body: { provenance: { kind: 'release' } } },
      });
      await user.click(await screen.findByRole('button', { name: 'Export release 1 as XLSX' }));
      await waitFor(() => expect(saved).toHaveLength(1));
      const call = network.callsTo('GET /api/releases/:releaseId/export')[0];
      expect(call.path).toBe(`/api/releases/${published.id}/export`);
      expect(call.query.get('format')).toBe('xlsx');
      expect(call.headers.get('Authorization')).toBe('Bearer test-access-token');
      expect(saved[0]).toEqual({ href: 'blob:test-export', download: 'release-1.xlsx' });
      expect(await screen.findByText('Saved release-1.xlsx')).toBeInTheDocument();
    });

    it('exports live data as a draft, for the runs chosen, clearly labelled', async () => {
      const { user, network } = renderReleases(['engineer'], {
        'GET /api/campaigns/:campaignId/export': { body: { provenance: { kind: 'draft' } } },
      });
      await user.click(await screen.findByRole('button', { name: /Draft export/ }));
      const dialog = await findDialog('Draft export of live data');
      expect(within(dialog).getByText('DRAFT — not a release')).toBeInTheDocument();
      await user.click(within(dialog).getByRole('radio', { name: 'CSV wide' }));
      await user.click(within(dialog).getByRole('checkbox', { name: 'Run 3, repeat' }));
      await user.click(within(dialog).getByRole('button', { name: 'Download draft CSV wide' }));
      await waitFor(() => expect(saved).toHaveLength(1));
      const call = network.callsTo('GET /api/campaigns/:campaignId/export')[0];
      expect(call.query.get('format')).toBe('csv-wide');
      expect(call.query.get('runIds')).toBe(`${RUN_A_ID},${RUN_B_ID}`);
      expect(saved[0].download).toBe('DRAFT-dialsheet-export-wide.csv');
    });

    it('shows the server’s message when an export is refused', async () => {
      const { user } = renderReleases(['reader'], {
        'GET /api/releases/:releaseId/export': apiError(400, 'format must be one of csv-long, csv-wide, xlsx, json'),
      });
      await user.click(await screen.findByRole('button', { name: 'Export release 1 as JSON' }));
      expect(await screen.findByText('The JSON export failed: format must be one of csv-long, csv-wide, xlsx, json')).toBeInTheDocument();
      expect(saved).toHaveLength(0);
    });
  });
});

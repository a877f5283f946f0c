import { describe, expect, it } from 'vitest';
import type { CampaignRole, CreateRunRequest, Run } from '@dialsheet/common';
import { findDialog, renderApp, screen, within } from '@/testing/test-utils';
import { makeCampaign, makeRecording, makeRun, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';

const campaignId = '10000000-0000-4000-8000-000000000001';

function campaignRoutes(myRoles: CampaignRole[]): StubRoutes {
  return {
    'GET /api/campaigns': { body: [makeCampaign({ myRoles })] },
    'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles }) },
  };
}

describe('runs list', () => {
  it('explains an empty list, creates a run and opens its page', async () => {
    const created: Run[] = [];
    const { user, network, router } = renderApp(`/campaigns/${campaignId}/runs`, {
      user: makeUser(),
      routes: {
        ...campaignRoutes(['engineer']),
        'GET /api/campaigns/:campaignId/runs': () => ({ body: created }),
        'POST /api/campaigns/:campaignId/runs': ({ body }: StubRequest) => {
          const request = body as CreateRunRequest;
          const run = makeRun({
            id: '30000000-0000-4000-8000-0000000000aa',
            name: request.name,
            runDate: request.runDate ?? null,
            configuration: request.configuration ?? '',
          });
          created.push(run);
          return { status: 201, body: run };
        },
        'GET /api/runs/:runId': ({ params }: StubRequest) => ({ body: created.find((r) => r.id === params.runId) }),
        'GET /api/runs/:runId/recording': apiError(404, 'This run has no recording yet'),
        'GET /api/campaigns/:campaignId/channels': { body: [] },
        // The run page also lists the run's reading sheets, with member names.
        'GET /api/runs/:runId/sheets': { body: [] },
        'GET /api/campaigns/:campaignId/members': { body: [] },
      },
    });

    expect(await screen.findByText('No runs yet')).toBeInTheDocument();
    await user.click(screen.getAllByRole('button', { name: /New run/ })[0]);
    const dialog = await findDialog('New run');
    await user.click(within(dialog).getByRole('button', { name: 'Create run' }));
    expect(await within(dialog).findByText('Give the run a name')).toBeInTheDocument();
    expect(network.callsTo('POST /api/campaigns/:campaignId/runs')).toHaveLength(0);

    await user.type(within(dialog).getByLabelText('Name'), '  Run 2, meter on cool stream ');
    await user.type(within(dialog).getByLabelText('Configuration'), 'flow meter on cool stream');
    await user.click(within(dialog).getByRole('button', { name: 'Create run' }));

    expect(await screen.findByRole('heading', { name: 'Run 2, meter on cool stream' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe(`/campaigns/${campaignId}/runs/30000000-0000-4000-8000-0000000000aa`);
    expect(network.callsTo('POST /api/campaigns/:campaignId/runs')[0].body).toEqual({
      name: 'Run 2, meter on cool stream',
      runDate: null,
      configuration: 'flow meter on cool stream',
      operator: '',
      notes: '',
    });
    // No video yet: an engineer gets the upload area.
    expect(await screen.findByText(/Drop the run’s video here/)).toBeInTheDocument();
    expect(network.unhandled).toEqual([]);
  });

  it('lists runs with their video status, fingerprint and sync; a reader cannot create runs', async () => {
    const ready = makeRun({
      name: 'Run 1',
      recording: makeRecording(),
      sync: { first: { videoTime: 2, testTime: 0 } },
    });
    const processing = makeRun({
      id: '30000000-0000-4000-8000-000000000002',
      name: 'Run 2',
      recording: makeRecording({ id: '40000000-0000-4000-8000-000000000002', status: 'transcoding', progress: 42.4, sha256: 'ab'.repeat(32) }),
    });
    const empty = makeRun({ id: '30000000-0000-4000-8000-000000000003', name: 'Run 3', runDate: null });
    renderApp(`/campaigns/${campaignId}/runs`, {
      user: makeUser(),
      routes: { ...campaignRoutes(['reader']), 'GET /api/campaigns/:campaignId/runs': { body: [ready, processing, empty] } },
    });

    const row1 = (await screen.findByRole('link', { name: 'Run 1' })).closest('tr')!;
    expect(within(row1).getByText('Ready')).toBeInTheDocument();
    expect(within(row1).getByText('0348392cff4c')).toBeInTheDocument();
    expect(within(row1).getByText('Set')).toBeInTheDocument();
    const row2 = screen.getByRole('link', { name: 'Run 2' }).closest('tr')!;
    expect(within(row2).getByText(/Making the playback copy\s*42 %/)).toBeInTheDocument();
    expect(within(row2).getByText('abababababab')).toBeInTheDocument();
    const row3 = screen.getByRole('link', { name: 'Run 3' }).closest('tr')!;
    expect(within(row3).getByText('No video')).toBeInTheDocument();
    expect(within(row3).getByText('Not set')).toBeInTheDocument();

    expect(screen.queryByRole('button', { name: /New run/ })).not.toBeInTheDocument();
    expect(screen.getByText('Only a lead or engineer of this campaign creates runs and uploads videos.')).toBeInTheDocument();
  });
});

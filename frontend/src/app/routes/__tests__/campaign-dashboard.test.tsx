import { describe, expect, it } from 'vitest';
import type { CampaignRole } from '@dialsheet/common';
import { renderApp, screen, within } from '@/testing/test-utils';
import { makeCampaign, makeUser } from '@/testing/fixtures';
import { apiError, type StubRoutes } from '@/testing/fetch-stub';
import {
  RELEASE_CAMPAIGN_ID,
  RUN_A_ID,
  RUN_B_ID,
  makeDashboard,
  makeDashboardRun,
  makeDashboardSheet,
  makeReaderRate,
} from '@/features/releases/testing/release-fixtures';

function renderDashboard(roles: CampaignRole[], routes: StubRoutes) {
  return renderApp(`/campaigns/${RELEASE_CAMPAIGN_ID}/dashboard`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      ...routes,
    },
  });
}

describe('campaign dashboard', () => {
  it('shows each sheet’s progress per pass, open mismatches, locks, readiness, analyses and reader rates', async () => {
    const dashboard = makeDashboard({
      runs: [
        makeDashboardRun({ lockedBy: { releaseId: '80000000-0000-4000-8000-000000000001', number: 2 } }),
        makeDashboardRun({
          id: RUN_B_ID,
          name: 'Run 2, meter on cool stream',
          readyToRelease: false,
          sheets: [
            makeDashboardSheet({
              id: '60000000-0000-4000-8000-000000000002',
              runId: RUN_B_ID,
              name: 'Steady state, every 5 s',
              cells: 240,
              pass1Entered: 240,
              pass2Entered: 60,
              pass2Finished: false,
              openMismatches: 4,
            }),
          ],
        }),
        makeDashboardRun({ id: '30000000-0000-4000-8000-000000000003', name: 'Run 3, repeat', sheets: [makeDashboardSheet({ id: '60000000-0000-4000-8000-000000000003', name: 'Repeat sheet' })] }),
      ],
      analyses: { total: 5, stale: 2, failed: 1 },
      readerRates: [
        makeReaderRate(),
        makeReaderRate({ channelId: '50000000-0000-4000-8000-000000000002', channelSymbol: 'V1', compared: 200, mismatches: 0, rate: 0 }),
        makeReaderRate({ userId: '00000000-0000-4000-8000-000000000003', displayName: 'Chris Checker', compared: 0, mismatches: 0, rate: null }),
      ],
    });
    const { network } = renderDashboard(['lead'], { 'GET /api/campaigns/:campaignId/dashboard': { body: dashboard } });

    const runs = await screen.findByRole('table', { name: 'Runs and sheets' });
    // 60 of 240 cells = 25 % (plain ratio); the group's label carries the counts.
    const pass2 = within(runs).getByRole('group', { name: 'Steady state, every 5 s, pass 2: 60 of 240 cells entered' });
    expect(within(pass2).getByRole('progressbar')).toHaveAttribute('aria-valuenow', '25');
    expect(within(runs).getByRole('group', { name: 'Steady state, every 5 s, pass 1: 240 of 240 cells entered, finished' })).toBeInTheDocument();
    const run2 = within(runs).getByRole('link', { name: 'Run 2, meter on cool stream' }).closest('tr')!;
    expect(run2).toHaveTextContent('4 open mismatches');
    expect(run2).not.toHaveTextContent('ready to release');

    // Run 1 is locked by release 2: it shows the lock, not "ready".
    const run1 = within(runs).getByRole('link', { name: 'Run 1, meter on warm stream' }).closest('tr')!;
    expect(run1).toHaveTextContent('release 2');
    expect(run1).not.toHaveTextContent('ready to release');
    const run3 = within(runs).getByRole('link', { name: 'Run 3, repeat' }).closest('tr')!;
    expect(run3).toHaveTextContent('ready to release');

    expect(screen.getByText('Runs ready to release').closest('.ant-statistic')).toHaveTextContent('1/ 3');
    const openStat = screen.getAllByText('Open mismatches').find((el) => el.closest('.ant-statistic'));
    expect(openStat?.closest('.ant-statistic')).toHaveTextContent('4');
    const analyses = screen.getByLabelText('Analyses');
    expect(analyses).toHaveTextContent('5');
    expect(analyses).toHaveTextContent('2 stale');
    expect(analyses).toHaveTextContent('1 failed');

    // 3 of 120 = 2.5 %; 0 of 200 = 0.0 %; nothing compared: no rate.
    const rates = screen.getByRole('table', { name: 'Mismatch rate per reader and channel' });
    expect(within(rates).getByLabelText('Rudi Reader, T1: 2.5 % (3 of 120)')).toBeInTheDocument();
    expect(within(rates).getByLabelText('Rudi Reader, V1: 0.0 % (0 of 200)')).toBeInTheDocument();
    expect(within(rates).getByLabelText('Chris Checker, T1: – (0 of 0)')).toBeInTheDocument();
    expect(screen.getByText('Ready to release').closest('.ant-alert')).toHaveTextContent('Run 3, repeat');
    expect(network.unhandled).toEqual([]);
  });

  it('says what to do when the campaign has no runs yet', async () => {
    renderDashboard(['engineer'], { 'GET /api/campaigns/:campaignId/dashboard': { body: makeDashboard({ runs: [] }) } });
    expect(await screen.findByText('Nothing to show yet')).toBeInTheDocument();
    expect(screen.getByRole('link', { name: 'Go to runs' })).toHaveAttribute('href', `/campaigns/${RELEASE_CAMPAIGN_ID}/runs`);
  });

  it('shows the server’s refusal as an error state, not an empty page', async () => {
    renderDashboard(['reader'], { 'GET /api/campaigns/:campaignId/dashboard': apiError(403, 'Only leads and engineers see the dashboard') });
    expect(await screen.findByText('You do not have access to this')).toBeInTheDocument();
    expect(screen.getByText('The dashboard is for the campaign’s leads and engineers.')).toBeInTheDocument();
  });

  it('links each run to its page', async () => {
    renderDashboard(['lead'], { 'GET /api/campaigns/:campaignId/dashboard': { body: makeDashboard() } });
    expect(await screen.findByRole('link', { name: 'Run 1, meter on warm stream' })).toHaveAttribute(
      'href',
      `/campaigns/${RELEASE_CAMPAIGN_ID}/runs/${RUN_A_ID}`,
    );
  });
});

import { afterEach, describe, expect, it, vi } from 'vitest';
import type { BalanceAnalysis, CampaignRole, StableValueAnalysis } from '@dialsheet/common';
import { renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeMember, makeRun, makeUser } from '@/testing/fixtures';
import type { StubRoutes } from '@/testing/fetch-stub';
import { CHECKER_ID, LEAD_ID, READER_ID, makeSheet } from '@/testing/sheet-fixtures';
import { makeFlowChannel, makeSeries, makeStableAnalysis } from '@/features/analysis/testing/analysis-fixtures';
import { HASH, RELEASE_CAMPAIGN_ID, RUN_A_ID, RUN_B_ID, makeRelease } from '@/features/releases/testing/release-fixtures';

// jsdom has no layout for a chart: the chart is replaced by the legend of the option it was given.
vi.mock('@/features/releases/components/report-chart', () => ({
  ReportChart: ({ option }: { option: { legend?: { data?: string[] } } }) => (
    <div data-testid="report-chart-stub" data-legend={JSON.stringify(option.legend?.data ?? [])} />
  ),
}));

const release = makeRelease({ runIds: [RUN_A_ID], note: 'Signed after review of every mismatch frame.' });
const channel = makeFlowChannel();
const series = makeSeries({ runId: RUN_A_ID });
const base = makeStableAnalysis({ id: '90000000-0000-4000-8000-000000000001', name: 'Warm stream flow', series, channel });

// Hand-chosen figures, so the test states what the page must print.
const flow: StableValueAnalysis = {
  ...base,
  result: {
    stable: {
      ...base.result!.stable,
      value: 12.3456,
      expandedUncertainty: 0.0567,
      unit: 'g/min',
      budget: { ...base.result!.stable.budget, coverageFactor: 2, relativeExpandedPercent: 0.4593 },
    },
    stability: {
      rule: 'Steady 40 s',
      window: { from: 18, to: 58 },
      n: 21,
      pass: false,
      parts: [
        { part: 'slope', pass: false, measured: 0.081, limit: 0.05, unit: 'g/min per min', message: 'too steep' },
        { part: 'band', pass: true, measured: 0.012, limit: 0.02, unit: 'g/min', message: 'inside the band' },
      ],
    },
  },
};

// A stable value of a run outside the release: not in its report.
const other = makeStableAnalysis({ id: '90000000-0000-4000-8000-000000000002', name: 'Cool stream flow', series: makeSeries({ runId: RUN_B_ID }), channel });

const balance: BalanceAnalysis = {
  ...base,
  id: '90000000-0000-4000-8000-000000000003',
  kind: 'balance',
  name: 'Core mass balance',
  runIds: [RUN_A_ID],
  status: 'stale',
  staleReason: 'readings of Run 1 changed',
  input: { streams: [], energy: false },
  result: {
    mass: {
      kind: 'mass',
      sumIn: 50.2,
      sumOut: 49.58,
      unit: 'g/min',
      terms: [],
      ratio: 0.98765,
      closurePercent: -1.234,
      standardUncertainty: 0.0123,
      coverageFactor: 2,
      expandedUncertainty: 0.0246,
      expandedUncertaintyPercent: 2.46,
      normalisedError: 0.5016,
      pass: true,
      budget: [{ sourceId: 'meter', name: 'flow meter accuracy', streams: ['warm in', 'warm out'], effect: 0.0102, percentOfVariance: 68.7 }],
    },
    energy: null,
  },
};

const sheet = makeSheet({
  runId: RUN_A_ID,
  readerId: READER_ID,
  checkerId: CHECKER_ID,
  pass1FinishedAt: '2026-03-03T10:00:00.000Z',
  pass2FinishedAt: '2026-03-03T15:00:00.000Z',
  lock: { releaseId: release.id, releaseNumber: 1 },
});

function renderReport(roles: CampaignRole[], routes: StubRoutes = {}) {
  return renderApp(`/campaigns/${RELEASE_CAMPAIGN_ID}/releases/${release.id}/report`, {
    user: makeUser({ id: LEAD_ID }),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/releases/:releaseId': { body: release },
      // The release's own analyses, frozen when it was signed (never stale), not the live ones.
      'GET /api/releases/:releaseId/analyses': { body: [flow, other, { ...balance, status: 'current', staleReason: null }] },
      'GET /api/campaigns/:campaignId/analyses': { body: [flow, other, balance] },
      'GET /api/campaigns/:campaignId/runs': { body: [makeRun({ id: RUN_A_ID, name: 'Run 1, meter on warm stream' })] },
      'GET /api/campaigns/:campaignId/channels': { body: [channel] },
      'GET /api/campaigns/:campaignId/derived-channels': { body: [] },
      'GET /api/campaigns/:campaignId/members': {
        body: [
          makeMember({ userId: READER_ID, name: 'Rudi Reader', roles: ['reader'] }),
          makeMember({ userId: CHECKER_ID, name: 'Chris Checker', roles: ['checker'] }),
        ],
      },
      'GET /api/runs/:runId/sheets': { body: [sheet] },
      'GET /api/runs/:runId/series/:channelId': { body: series },
      ...routes,
    },
  });
}

describe('printable release report', () => {
  afterEach(() => vi.restoreAllMocks());

  it('prints the release header, stable values with U and k, verdicts, closures, and who read and checked', async () => {
    const { network } = renderReport(['lead']);
    expect(await screen.findByRole('heading', { name: 'Release 1: Baseline, meter on the warm stream' }, { timeout: 20_000 })).toBeInTheDocument();
    expect(screen.getByText(HASH)).toBeInTheDocument();
    expect(screen.getByText('Signed after review of every mismatch frame.')).toBeInTheDocument();

    const values = screen.getByRole('table', { name: 'Stable values' });
    // U to two significant digits and the value to the same decimal place (GUM, JCGM 100:2008 §7.2.6).
    const row = within(values).getByText('12.346 ± 0.057 g/min').closest('tr')!;
    expect(row).toHaveTextContent('Warm stream flow');
    expect(row).toHaveTextContent('Run 1, meter on warm stream');
    expect(row).toHaveTextContent('V1');
    expect(row).toHaveTextContent('0.459 %');
    expect(within(row).getAllByRole('cell')[5]).toHaveTextContent(/^2$/);
    expect(row).toHaveTextContent('not stable · Steady 40 s');
    expect(row).toHaveTextContent('FAIL slope: 0.081 (limit 0.05) g/min per min');
    expect(row).toHaveTextContent('pass band: 0.012 (limit 0.02) g/min');
    expect(within(values).queryByText('Cool stream flow')).not.toBeInTheDocument();

    expect(screen.getByTestId('closure-mass')).toHaveTextContent('-1.23 ± 2.5 % (k = 2)');
    // As signed: the live balance has gone stale since, which the report of the release ignores.
    expect(screen.getByText('Core mass balance').closest('article')).not.toHaveTextContent('stale');
    expect(network.callsTo('GET /api/campaigns/:campaignId/analyses')).toHaveLength(0);
    const budget = screen.getByRole('table', { name: 'Mass closure budget' });
    expect(within(budget).getByText('flow meter accuracy').closest('tr')).toHaveTextContent('warm in, warm out0.010268.7 %');

    const people = screen.getByRole('table', { name: 'Who read and who checked each sheet' });
    const sheetRow = within(people).getByText('Warm-up, every 2 s').closest('tr')!;
    expect(sheetRow).toHaveTextContent('Rudi Reader');
    expect(sheetRow).toHaveTextContent('Chris Checker');

    expect(screen.getByText('Results are not a safety clearance')).toBeInTheDocument();
    expect(screen.getByText(/do not replace local codes/)).toBeInTheDocument();

    // The run still holds the released data, so a lead's chart draws the readings too.
    await waitFor(() => expect(JSON.parse(screen.getByTestId('report-chart-stub').dataset.legend!)).toContain('readings'));
    expect(network.unhandled).toEqual([]);
  });

  it('prints through the browser’s print dialog', async () => {
    const print = vi.spyOn(window, 'print').mockImplementation(() => undefined);
    const { user } = renderReport(['reader']);
    await user.click(await screen.findByRole('button', { name: /Print/ }, { timeout: 20_000 }));
    expect(print).toHaveBeenCalledTimes(1);
  });

  it('previews a request not yet signed from the live analyses, tagging what went stale', async () => {
    const requested = { ...release, status: 'requested' as const, number: null, contentHash: null, signedBy: null, signedAt: null };
    const { network } = renderReport(['lead'], { 'GET /api/releases/:releaseId': { body: requested } });
    await screen.findByText('Not a signed release', undefined, { timeout: 20_000 });
    await waitFor(() => expect(screen.getByText('Core mass balance').closest('article')).toHaveTextContent('stale: readings of Run 1 changed'));
    expect(network.callsTo('GET /api/releases/:releaseId/analyses')).toHaveLength(0);
  });

  it('draws only the stored fit for a reader, who may not read the raw series', async () => {
    const { network } = renderReport(['reader']);
    await screen.findByRole('table', { name: 'Stable values' }, { timeout: 20_000 });
    expect(JSON.parse(screen.getByTestId('report-chart-stub').dataset.legend!)).not.toContain('readings');
    expect(network.callsTo('GET /api/runs/:runId/series/:channelId')).toHaveLength(0);
  });
});

import { describe, expect, it, vi } from 'vitest';
import type { Analysis, CampaignRole, ChannelSeries, CreateAnalysisRequest, StableValueAnalysis } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeRun, makeUser } from '@/testing/fixtures';
import type { StubRoutes } from '@/testing/fetch-stub';
import { evaluateStability, stableValue } from '@/features/analysis/utils/analysis-lib';
import { channelSpecFor, engineeringPoints, rawPoints } from '@/features/analysis/utils/stable-preview';
import { interval, plusMinus, sig } from '@/features/analysis/utils/number-format';
import {
  ANALYSIS_CAMPAIGN_ID,
  RUN_1_ID,
  makeFlowCalibration,
  makeFlowChannel,
  makeRule,
  makeSeries,
  makeStableAnalysis,
} from '@/features/analysis/testing/analysis-fixtures';
import { compileChain } from '@/features/analysis/utils/analysis-lib';

// jsdom has no canvas: the chart is replaced by its option's legend, which is what a test can read.
vi.mock('@/features/analysis/components/echart', () => ({
  EChart: ({ option }: { option: { legend?: { data?: string[] }; series?: Array<{ name: string; data: unknown[] }> } }) => (
    <div data-testid="echart-stub" data-legend={JSON.stringify(option.legend?.data ?? [])} data-series={JSON.stringify((option.series ?? []).map((s) => [s.name, s.data.length]))} />
  ),
}));

const channel = makeFlowChannel();
const calibration = makeFlowCalibration();
const chain = compileChain(calibration.chain, 'V');
const flowSeries = makeSeries({ toEngineering: chain.apply, unit: 'g/min' });

function renderRunAnalysis(roles: CampaignRole[], series: ChannelSeries = flowSeries, routes: StubRoutes = {}) {
  return renderApp(`/campaigns/${ANALYSIS_CAMPAIGN_ID}/runs/${RUN_1_ID}/analysis`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/runs/:runId': { body: makeRun() },
      'GET /api/campaigns/:campaignId/channels': { body: [channel] },
      'GET /api/campaigns/:campaignId/calibrations': { body: [calibration] },
      'GET /api/campaigns/:campaignId/derived-channels': { body: [] },
      'GET /api/campaigns/:campaignId/stability-rules': { body: [makeRule()] },
      'GET /api/campaigns/:campaignId/analyses': { body: [] },
      'GET /api/runs/:runId/series/:channelId': { body: series },
      ...routes,
    },
  });
}

/** What the page must show: the common function on the same series, window and t*. */
function expected(window: { from: number; to: number }, tStar: number, allowExtrapolation = false) {
  return stableValue(rawPoints(flowSeries), window, tStar, channelSpecFor(flowSeries, channel), calibration.chain, {
    allowExtrapolation,
    includeResolution: true,
  });
}

describe('run analysis page', () => {
  it('previews the stable value the common code computes for the series, and follows the window inputs', async () => {
    const { user, network } = renderRunAnalysis(['engineer']);
    const whole = expected({ from: 0, to: 58 }, 58);
    // The first page of the file compiles mathjs on import: allow it more than the usual wait.
    const headline = await screen.findByTestId('stable-value', {}, { timeout: 30_000 });
    expect(headline).toHaveTextContent(plusMinus(whole.value, whole.expandedUncertainty, 'g/min', 5));
    expect(screen.getByTestId('fit-slope')).toHaveTextContent(sig(whole.fit.slopePerMinute, 4));
    expect(screen.getByTestId('fit-r2')).toHaveTextContent(sig(whole.fit.rSquared, 4));
    expect(screen.getByTestId('fit-sd')).toHaveTextContent(sig(whole.fit.residualSd, 3));
    expect(screen.getByTestId('value-ci')).toHaveTextContent(interval(whole.prediction.meanInterval.low, whole.prediction.meanInterval.high, 'g/min', 5));
    expect(screen.getByTestId('value-pi')).toHaveTextContent(interval(whole.prediction.predictionInterval.low, whole.prediction.predictionInterval.high, 'g/min', 5));
    expect(screen.getByTestId('budget-U')).toHaveTextContent(sig(whole.budget.expandedUncertainty, 3));

    // Unchecked first-pass points are their own legend entry of the chart.
    const charts = screen.getAllByTestId('echart-stub');
    expect(JSON.parse(charts[0].dataset.legend!)).toContain('unchecked (first pass only)');
    const drawn = Object.fromEntries(JSON.parse(charts[0].dataset.series!) as Array<[string, number]>);
    expect(drawn['unchecked (first pass only)']).toBe(flowSeries.uncheckedCount);
    expect(drawn.readings).toBe(flowSeries.t.length - flowSeries.uncheckedCount);

    // The rule's verdict per part is the common evaluation at t*.
    const verdict = evaluateStability(makeRule(), engineeringPoints(flowSeries), { end: 58, unit: 'g/min' });
    const verdictView = screen.getByTestId('stability-verdict');
    for (const part of verdict.parts) expect(verdictView).toHaveTextContent(`${part.pass ? 'pass' : 'fail'} ${part.part}: ${part.message}`);

    const from = screen.getByLabelText('Window from');
    await user.clear(from);
    await user.type(from, '20');
    const narrow = expected({ from: 20, to: 58 }, 58);
    await waitFor(() => expect(from).toHaveValue('20'));
    await waitFor(() => expect(screen.getByTestId('stable-value')).toHaveTextContent(plusMinus(narrow.value, narrow.expandedUncertainty, 'g/min', 5)));
    expect(narrow.fit.n).toBeLessThan(whole.fit.n);
    expect(network.unhandled).toEqual([]);
  });

  it('asks before extrapolating to a t* outside the window', async () => {
    const { user } = renderRunAnalysis(['engineer']);
    await screen.findByTestId('stable-value');
    const tStar = screen.getByLabelText('t*');
    await user.clear(tStar);
    await user.type(tStar, '70');
    expect(await screen.findByText('t* lies outside the window’s readings')).toBeInTheDocument();
    expect(screen.queryByTestId('stable-value')).not.toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: 'Confirm extrapolation' }));
    const extrapolated = expected({ from: 0, to: 58 }, 70, true);
    await waitFor(() => expect(screen.getByTestId('stable-value')).toHaveTextContent(plusMinus(extrapolated.value, extrapolated.expandedUncertainty, 'g/min', 5)));
    expect(extrapolated.prediction.extrapolated).toBe(true);
  });

  it('saves the analysis with the inputs of the preview and shows the server’s result', async () => {
    // The server's own numbers differ on purpose: the page must show what the server stored.
    const base = makeStableAnalysis({ id: '80000000-0000-4000-8000-000000000001', name: 'Warm flow', series: flowSeries, channel, calibration });
    const fromServer: StableValueAnalysis = {
      ...base,
      result: { stability: null, stable: { ...base.result!.stable, value: 123.456, expandedUncertainty: 1.5 } },
    };
    const { user, network } = renderRunAnalysis(['engineer'], flowSeries, {
      'POST /api/campaigns/:campaignId/analyses': { status: 201, body: fromServer as Analysis },
    });
    await screen.findByTestId('stable-value');
    await user.click(screen.getByRole('button', { name: /Save as analysis/ }));
    const dialog = await findDialog('Save as analysis');
    const name = within(dialog).getByLabelText('Analysis name');
    await user.clear(name);
    await user.type(name, 'Warm flow{Enter}');
    await waitFor(() => expect(network.callsTo('POST /api/campaigns/:campaignId/analyses')).toHaveLength(1));
    const body = network.callsTo('POST /api/campaigns/:campaignId/analyses')[0].body as CreateAnalysisRequest;
    expect(body).toEqual({
      kind: 'stable-value',
      name: 'Warm flow',
      note: null,
      input: {
        runId: RUN_1_ID,
        channelId: channel.id,
        window: { from: 0, to: 58 },
        tStar: 58,
        ruleId: makeRule().id,
        allowExtrapolation: false,
        includeResolution: true,
      },
    });
    expect(await screen.findByTestId('saved-result')).toHaveTextContent(`Server result: ${plusMinus(123.456, 1.5, 'g/min', 5)}`);
  });

  it('says clearly when a channel has fewer than 3 readings', async () => {
    const short = makeSeries({ count: 2, toEngineering: chain.apply, unit: 'g/min' });
    renderRunAnalysis(['engineer'], short);
    expect(await screen.findByText('V1 has 2 usable readings in this run; a trend fit needs at least 3.')).toBeInTheDocument();
    expect(screen.queryByTestId('stable-value')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Save as analysis/ })).toBeDisabled();
  });

  it('a lead reads the chart and preview but cannot save; a reader is not sent the readings', async () => {
    const lead = renderRunAnalysis(['lead']);
    expect(await screen.findByTestId('stable-value')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Save as analysis/ })).not.toBeInTheDocument();
    lead.unmount();

    const saved = makeStableAnalysis({ id: '80000000-0000-4000-8000-000000000002', name: 'Flow, run 1', series: flowSeries, channel, calibration, status: 'stale', staleReason: 'readings of Run 1 changed' });
    const reader = renderRunAnalysis(['reader'], flowSeries, { 'GET /api/campaigns/:campaignId/analyses': { body: [saved] } });
    expect(await screen.findByText('The readings behind the charts are for the campaign’s lead and engineer')).toBeInTheDocument();
    const row = (await screen.findByText('Flow, run 1')).closest('tr')!;
    expect(row).toHaveTextContent(plusMinus(saved.result!.stable.value, saved.result!.stable.expandedUncertainty, 'g/min', 5));
    expect(row).toHaveTextContent('stale');
    expect(row).toHaveTextContent('readings of Run 1 changed');
    expect(within(row).queryByRole('button', { name: /Recompute/ })).not.toBeInTheDocument();
    expect(reader.network.callsTo('GET /api/runs/:runId/series/:channelId')).toHaveLength(0);
  });
});

import { describe, expect, it } from 'vitest';
import type { Analysis, BalanceAnalysis, CampaignRole, CreateAnalysisRequest } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor } from '@/testing/test-utils';
import { makeCampaign, makeRun, makeUser } from '@/testing/fixtures';
import type { StubRoutes } from '@/testing/fetch-stub';
import { compileChain, energyBalance, massBalance, measuredFromBudget } from '@/features/analysis/utils/analysis-lib';
import { sig } from '@/features/analysis/utils/number-format';
import {
  ANALYSIS_CAMPAIGN_ID,
  RUN_1_ID,
  RUN_2_ID,
  makeFlowCalibration,
  makeFlowChannel,
  makeSeries,
  makeTempChannel,
  makeStableAnalysis,
} from '@/features/analysis/testing/analysis-fixtures';

const channel = makeFlowChannel();
const calibration = makeFlowCalibration();
const chain = compileChain(calibration.chain, 'V');
// One meter moved between runs: on the warm stream in run 1, on the cool stream in run 2.
const warm = makeStableAnalysis({
  id: '80000000-0000-4000-8000-000000000011',
  name: 'Warm flow',
  series: makeSeries({ base: 2.5, runId: RUN_1_ID, toEngineering: chain.apply, unit: 'g/min' }),
  channel,
  calibration,
});
const cool = makeStableAnalysis({
  id: '80000000-0000-4000-8000-000000000012',
  name: 'Cool flow',
  series: makeSeries({ base: 2.46, runId: RUN_2_ID, toEngineering: chain.apply, unit: 'g/min' }),
  channel,
  calibration,
});

const tempChannel = makeTempChannel();
const warmT = makeStableAnalysis({
  id: '80000000-0000-4000-8000-000000000013',
  name: 'Warm inlet T',
  series: makeSeries({ base: 40, drift: -0.002, runId: RUN_1_ID, channel: tempChannel }),
  channel: tempChannel,
});
const coolT = makeStableAnalysis({
  id: '80000000-0000-4000-8000-000000000014',
  name: 'Cool outlet T',
  series: makeSeries({ base: 39.2, drift: 0.001, runId: RUN_2_ID, channel: tempChannel }),
  channel: tempChannel,
});

function renderBalance(roles: CampaignRole[], analyses: Analysis[], routes: StubRoutes = {}) {
  return renderApp(`/campaigns/${ANALYSIS_CAMPAIGN_ID}/balance`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/campaigns/:campaignId/channels': { body: [channel] },
      'GET /api/campaigns/:campaignId/runs': { body: [makeRun(), makeRun({ id: RUN_2_ID, name: 'Run 2, meter on cool stream' })] },
      'GET /api/campaigns/:campaignId/derived-channels': { body: [] },
      'GET /api/campaigns/:campaignId/analyses': { body: analyses },
      ...routes,
    },
  });
}

async function pick(user: ReturnType<typeof renderBalance>['user'], comboboxName: string, optionTitlePrefix: string) {
  await user.click(screen.getByRole('combobox', { name: comboboxName }));
  const option = await waitFor(() => {
    const open = [...document.querySelectorAll('.ant-select-dropdown:not(.ant-select-dropdown-hidden)')].at(-1);
    const found = open?.querySelector<HTMLElement>(`.ant-select-item-option[title^="${optionTitlePrefix}"]`);
    if (!found) throw new Error(`no option "${optionTitlePrefix}" yet`);
    return found;
  });
  await user.click(option);
}

describe('balance page', () => {
  it('computes the mass closure live from two saved stable values and saves it as a named balance', async () => {
    const { user, network } = renderBalance(['engineer'], [warm, cool], {
      'POST /api/campaigns/:campaignId/analyses': ({ body }) => ({ status: 201, body: { ...warm, id: 'b1', kind: 'balance', name: (body as { name: string }).name } }),
    });
    // The first page of the file compiles mathjs on import: allow it more than the usual wait.
    await screen.findByRole('combobox', { name: 'Stream 1 mass flow' }, { timeout: 30_000 });
    expect(screen.getByText('No balances saved yet')).toBeInTheDocument();
    await pick(user, 'Stream 1 mass flow', 'Warm flow');
    await pick(user, 'Stream 2 mass flow', 'Cool flow');

    // Σout/Σin from the common balance on the two budgets (the shared meter's effects correlate).
    const result = massBalance([
      { id: 'in', label: 'in', side: 'in', massFlow: measuredFromBudget(warm.result!.stable.budget) },
      { id: 'out', label: 'out', side: 'out', massFlow: measuredFromBudget(cool.result!.stable.budget) },
    ]);
    const closure = await screen.findByTestId('closure-mass-percent');
    expect(closure).toHaveTextContent(`closure ${sig(result.closurePercent, 3)} % ± ${sig(result.expandedUncertaintyPercent, 2)} %`);
    expect(screen.getByRole('img', { name: `mass closure ${sig(result.closurePercent, 3)} % ± ${sig(result.expandedUncertaintyPercent, 2)} %` })).toBeInTheDocument();
    expect(screen.getByTestId('closure-mass')).toHaveTextContent(result.pass ? 'closes within its uncertainty' : 'does not close');
    // Every source of the closure's uncertainty is a line of its budget.
    for (const line of result.budget) expect(screen.getByTestId('closure-mass')).toHaveTextContent(line.name);

    await user.click(screen.getByRole('button', { name: /Save balance/ }));
    const dialog = await findDialog('Save balance');
    await user.type(screen.getByLabelText('Balance name'), 'Mass, runs 1–2{Enter}');
    await waitFor(() => expect(network.callsTo('POST /api/campaigns/:campaignId/analyses')).toHaveLength(1));
    const body = network.callsTo('POST /api/campaigns/:campaignId/analyses')[0].body as CreateAnalysisRequest;
    expect(body.kind).toBe('balance');
    expect(body.name).toBe('Mass, runs 1–2');
    if (body.kind !== 'balance') throw new Error('not a balance');
    expect(body.input.energy).toBe(false);
    expect(body.input.streams.map((s) => [s.side, s.massFlowAnalysisId])).toEqual([
      ['in', warm.id],
      ['out', cool.id],
    ]);
    await waitFor(() => expect(dialog).not.toBeVisible());
  });

  it('adds the energy closure by constant cp from the streams’ temperatures', async () => {
    const { user } = renderBalance(['engineer'], [warm, cool, warmT, coolT]);
    await screen.findByRole('combobox', { name: 'Stream 1 mass flow' }, { timeout: 30_000 });
    await pick(user, 'Stream 1 mass flow', 'Warm flow');
    await pick(user, 'Stream 2 mass flow', 'Cool flow');
    await user.click(screen.getByRole('checkbox', { name: /Energy balance as well/ }));
    await pick(user, 'Stream 1 temperature', 'Warm inlet T');
    await pick(user, 'Stream 2 temperature', 'Cool outlet T');

    // ṁ·cp·(T − 0 °C) with ASHRAE's dry-air cp of 1006 J/(kg K), from the common balance.
    const result = energyBalance(
      [
        { id: 'in', label: 'in', side: 'in', massFlow: measuredFromBudget(warm.result!.stable.budget), temperature: measuredFromBudget(warmT.result!.stable.budget) },
        { id: 'out', label: 'out', side: 'out', massFlow: measuredFromBudget(cool.result!.stable.budget), temperature: measuredFromBudget(coolT.result!.stable.budget) },
      ],
      { kind: 'constant-cp', cp: 1006, referenceTemperatureC: 0 },
    );
    expect(await screen.findByTestId('closure-energy-percent')).toHaveTextContent(
      `closure ${sig(result.closurePercent, 3)} % ± ${sig(result.expandedUncertaintyPercent, 2)} %`,
    );
    expect(result.unit).toBe('W');
  });

  it('a reader sees saved balances with their closure but no editor', async () => {
    const mass = massBalance([
      { id: 's1', label: 'Warm', side: 'in', massFlow: measuredFromBudget(warm.result!.stable.budget) },
      { id: 's2', label: 'Cool', side: 'out', massFlow: measuredFromBudget(cool.result!.stable.budget) },
    ]);
    const saved: BalanceAnalysis = {
      ...warm,
      id: '90000000-0000-4000-8000-000000000001',
      kind: 'balance',
      name: 'Mass, runs 1–2',
      runIds: [RUN_1_ID, RUN_2_ID],
      input: {
        energy: false,
        streams: [
          { id: 's1', label: 'Warm', side: 'in', massFlowAnalysisId: warm.id },
          { id: 's2', label: 'Cool', side: 'out', massFlowAnalysisId: cool.id },
        ],
      },
      result: { mass, energy: null },
    };
    renderBalance(['reader'], [warm, cool, saved]);
    const row = (await screen.findByText('Mass, runs 1–2', {}, { timeout: 30_000 })).closest('tr')!;
    expect(row).toHaveTextContent(`${sig(mass.closurePercent, 3)} % ± ${sig(mass.expandedUncertaintyPercent, 2)} %`);
    expect(screen.queryByText('New balance')).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Recompute/ })).not.toBeInTheDocument();
    expect(screen.getByText('Results are not a safety clearance')).toBeInTheDocument();
  });
});

import { describe, expect, it } from 'vitest';
import type { CampaignRole, CalibrationChain, LinearStep, SetCalibrationRequest } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeRun, makeUser } from '@/testing/fixtures';
import { apiError, type StubRoutes } from '@/testing/fetch-stub';
import { compileChain } from '@/features/analysis/utils/analysis-lib';
import {
  ANALYSIS_CAMPAIGN_ID,
  makeFlowCalibration,
  makeFlowChannel,
  makeRule,
  makeTempChannel,
} from '@/features/analysis/testing/analysis-fixtures';

const flow = makeFlowChannel();
const temp = makeTempChannel();

function renderSetup(roles: CampaignRole[], routes: StubRoutes = {}) {
  return renderApp(`/campaigns/${ANALYSIS_CAMPAIGN_ID}/analysis`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/campaigns/:campaignId/channels': { body: [flow, temp] },
      'GET /api/campaigns/:campaignId/runs': { body: [makeRun()] },
      'GET /api/campaigns/:campaignId/calibrations': { body: [makeFlowCalibration()] },
      'GET /api/campaigns/:campaignId/derived-channels': { body: [] },
      'GET /api/campaigns/:campaignId/stability-rules': { body: [makeRule()] },
      'GET /api/campaigns/:campaignId/analyses': { body: [] },
      ...routes,
    },
  });
}

/** The message the common compiler gives for a chain (what the editor must show). */
function compileError(chain: CalibrationChain, rawUnit: string): string {
  try {
    compileChain(chain, rawUnit);
  } catch (error) {
    return (error as Error).message;
  }
  throw new Error('the chain compiled; the test expected it not to');
}

async function openEditor(user: ReturnType<typeof renderSetup>['user'], symbol: string) {
  // The first page of the file compiles mathjs on import: allow it more than the usual wait.
  await user.click(await screen.findByRole('button', { name: `Edit calibration of ${symbol}` }, { timeout: 30_000 }));
  return findDialog(`Calibration of ${symbol}`);
}

describe('calibration editor', () => {
  it('shows the compiler’s error for a chain that does not work and saves nothing until it does', async () => {
    const { user, network } = renderSetup(['engineer']);
    const dialog = await openEditor(user, 'V1');

    // The stored chain previews 2.5 V through both steps (value from the same compiler).
    const stored = makeFlowCalibration().chain;
    const expected = compileChain(stored, 'V').apply(2.5);
    const rawInput = within(dialog).getByLabelText('Raw value');
    await user.clear(rawInput);
    await user.type(rawInput, '2.5');
    await waitFor(() => expect(within(dialog).getByTestId('calibration-preview')).toHaveTextContent(`2.5 V → ${Number(expected.toPrecision(5))} g/min`));

    // Step 2 made to take kPa: the hand-over from step 1 (SLPM) no longer fits.
    const unitInput = within(dialog).getByLabelText('Step 2 input unit');
    await user.clear(unitInput);
    await user.type(unitInput, 'kPa');
    const bad: CalibrationChain = { steps: [stored.steps[0], { ...stored.steps[1], inputUnit: 'kPa' }] };
    const alert = await within(dialog).findByText('The chain does not work yet');
    expect(alert.closest('[role="alert"]')).toHaveTextContent(compileError(bad, 'V'));
    expect(within(dialog).getByRole('button', { name: 'Save calibration' })).toBeDisabled();
    expect(network.callsTo('PUT /api/channels/:channelId/calibration')).toHaveLength(0);
  });

  it('saves with the stored version as baseVersion (Enter in a field saves), and offers a reload on 409', async () => {
    const current = makeFlowCalibration({ version: 4, chain: { steps: [{ ...(makeFlowCalibration().chain.steps[0] as LinearStep), a: 250 }] } });
    const { user, network } = renderSetup(['engineer'], {
      'PUT /api/channels/:channelId/calibration': {
        status: 409,
        body: { statusCode: 409, error: 'Conflict', message: 'This calibration was changed by someone else since you loaded it; reload it and make your change again', current },
      },
    });
    const dialog = await openEditor(user, 'V1');
    const gain = within(dialog).getByLabelText('Step 1 gain a');
    await user.clear(gain);
    await user.type(gain, '280{Enter}');

    await waitFor(() => expect(network.callsTo('PUT /api/channels/:channelId/calibration')).toHaveLength(1));
    const request = network.callsTo('PUT /api/channels/:channelId/calibration')[0];
    expect(request.params.channelId).toBe(flow.id);
    const body = request.body as SetCalibrationRequest;
    expect(body.baseVersion).toBe(3);
    expect(body.chain.steps).toHaveLength(2);
    expect(body.chain.steps[0]).toMatchObject({ kind: 'linear', a: 280, b: 0, inputUnit: 'V', outputUnit: 'SLPM' });

    // The 409 keeps the dialog open with a reload that loads the other person's chain.
    expect(await within(dialog).findByText('Someone changed this calibration since you opened it')).toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: 'Reload' }));
    await waitFor(() => expect(within(dialog).getByLabelText('Step 1 gain a')).toHaveValue('250'));
    expect(within(dialog).queryByLabelText('Step 2 kind')).not.toBeInTheDocument();
    expect(network.unhandled).toEqual([]);
  });

  it('a first calibration is sent without baseVersion', async () => {
    const { user, network } = renderSetup(['engineer'], {
      'PUT /api/channels/:channelId/calibration': ({ body }) => ({ body: { ...makeFlowCalibration(), channelId: temp.id, chain: (body as SetCalibrationRequest).chain, version: 1 } }),
    });
    const dialog = await openEditor(user, 'T1');
    expect(within(dialog).getByText('No steps: readings stay in °C.')).toBeInTheDocument();
    await user.click(within(dialog).getByRole('button', { name: /Add step/ }));
    await user.type(within(dialog).getByLabelText('Step 1 gain a'), '1.002');
    await user.type(within(dialog).getByLabelText('Step 1 output unit'), '°C');
    await user.click(within(dialog).getByRole('button', { name: 'Save calibration' }));
    await waitFor(() => expect(network.callsTo('PUT /api/channels/:channelId/calibration')).toHaveLength(1));
    const body = network.callsTo('PUT /api/channels/:channelId/calibration')[0].body as SetCalibrationRequest;
    expect(body.baseVersion).toBeUndefined();
    expect(body.chain.steps[0]).toMatchObject({ kind: 'linear', a: 1.002, b: 0, inputUnit: '°C', outputUnit: '°C' });
    await waitFor(() => expect(screen.queryByRole('dialog')).not.toBeInTheDocument());
  });

  it('shows a server refusal of a derived channel inline', async () => {
    const { user, network } = renderSetup(['engineer'], {
      'POST /api/campaigns/:campaignId/derived-channels': apiError(400, 'symbol T1 is already a channel of this campaign'),
    });
    await user.click(await screen.findByRole('button', { name: /New derived channel/ }));
    const dialog = await findDialog('New derived channel');
    await user.type(within(dialog).getByLabelText('Name'), 'Heat rate');
    await user.type(within(dialog).getByLabelText('Symbol'), 'T1');
    await user.type(within(dialog).getByLabelText('Unit'), 'W');
    await user.type(within(dialog).getByLabelText('Expression'), 'V1 * (T1 - X9)');
    expect(await within(dialog).findByText('The expression does not work yet')).toBeInTheDocument();
    expect(within(dialog).getByRole('alert')).toHaveTextContent('unknown symbol "X9"');
    const expression = within(dialog).getByLabelText('Expression');
    await user.clear(expression);
    await user.type(expression, 'V1 * (T1 - 20){Enter}');
    await waitFor(() => expect(network.callsTo('POST /api/campaigns/:campaignId/derived-channels')).toHaveLength(1));
    expect(network.callsTo('POST /api/campaigns/:campaignId/derived-channels')[0].body).toEqual({
      name: 'Heat rate',
      symbol: 'T1',
      unit: 'W',
      expression: 'V1 * (T1 - 20)',
      constants: {},
    });
    expect(await within(dialog).findByText('symbol T1 is already a channel of this campaign')).toBeInTheDocument();
  });
});

describe('analysis set-up, read only', () => {
  it('a reader sees the calibrations and rules but no edit buttons', async () => {
    renderSetup(['reader', 'checker']);
    expect(await screen.findByText('Steady 40 s')).toBeInTheDocument();
    expect(await screen.findByText('linear V → SLPM · standard-to-mass SLPM → g/min')).toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /Edit calibration/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /New derived channel/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: /New rule/ })).not.toBeInTheDocument();
    expect(screen.getByText('Only an engineer of this campaign sets calibrations.')).toBeInTheDocument();
    expect(screen.getByText('No stable values saved yet')).toBeInTheDocument();
    expect(screen.getAllByText('Results are not a safety clearance').length).toBeGreaterThan(0);
  });
});

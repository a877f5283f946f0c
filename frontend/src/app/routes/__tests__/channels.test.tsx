import { describe, expect, it } from 'vitest';
import type { CampaignRole, Channel, CreateChannelRequest } from '@dialsheet/common';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';

const campaignId = '10000000-0000-4000-8000-000000000001';
const at = '2026-03-02T09:15:00.000Z';

function makeChannel(overrides: Partial<Channel> = {}): Channel {
  return {
    id: '50000000-0000-4000-8000-000000000001',
    campaignId,
    name: 'Warm stream inlet temperature',
    symbol: 'T1',
    quantity: 'temperature',
    rawUnit: '°C',
    resolution: 0.1,
    rangeMin: -50,
    rangeMax: 200,
    fullScale: 200,
    operatingMin: -40,
    operatingMax: 180,
    accuracy: { percentOfFullScale: 0.5, percentOfReading: 0.2, digits: 2 },
    plausibleMin: 5,
    plausibleMax: 90,
    position: 0,
    createdAt: at,
    updatedAt: at,
    ...overrides,
  };
}

const t1 = makeChannel();
const p1 = makeChannel({
  id: '50000000-0000-4000-8000-000000000002',
  name: 'Supply pressure',
  symbol: 'P1',
  quantity: 'pressure',
  rawUnit: 'kPa',
  resolution: 1,
  rangeMin: 0,
  rangeMax: 600,
  fullScale: null,
  operatingMin: null,
  operatingMax: null,
  accuracy: { percentOfReading: 1 },
  plausibleMin: null,
  plausibleMax: 450,
  position: 1,
});
const f1 = makeChannel({
  id: '50000000-0000-4000-8000-000000000003',
  name: 'Cool stream flow',
  symbol: 'F1',
  quantity: 'volume flow',
  rawUnit: 'L/min',
  resolution: 0.01,
  rangeMin: 0,
  rangeMax: 30,
  fullScale: 30,
  accuracy: null,
  operatingMin: null,
  operatingMax: null,
  plausibleMin: null,
  plausibleMax: null,
  position: 2,
});

function campaignRoutes(myRoles: CampaignRole[]): StubRoutes {
  return {
    'GET /api/campaigns': { body: [makeCampaign({ myRoles })] },
    'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles }) },
  };
}

describe('channels page', () => {
  it('lists channels with units beside values and the accuracy spec; a reader gets no edit controls', async () => {
    const { network } = renderApp(`/campaigns/${campaignId}/channels`, {
      user: makeUser(),
      routes: { ...campaignRoutes(['reader']), 'GET /api/campaigns/:campaignId/channels': { body: [t1, p1, f1] } },
    });

    const row = (await screen.findByText('Warm stream inlet temperature')).closest('tr')!;
    expect(within(row).getByText('T1')).toBeInTheDocument();
    expect(row).toHaveTextContent('0.1 °C');
    expect(row).toHaveTextContent('−50 … 200 °C');
    expect(row).toHaveTextContent('−40 … 180 °C');
    expect(row).toHaveTextContent('5 … 90 °C');
    expect(within(row).getByText('±0.5 % FS')).toBeInTheDocument();
    expect(within(row).getByText('±0.2 % rdg + 2 digits')).toBeInTheDocument();

    const pressure = screen.getByText('Supply pressure').closest('tr')!;
    expect(pressure).toHaveTextContent('0 … 600 kPa');
    expect(pressure).toHaveTextContent('≤ 450 kPa');
    expect(within(pressure).getByText('±1 % rdg')).toBeInTheDocument();

    expect(screen.queryByRole('button', { name: /New channel/ })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Move T1 down' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Edit T1' })).not.toBeInTheDocument();
    expect(screen.queryByRole('button', { name: 'Delete T1' })).not.toBeInTheDocument();
    expect(screen.getByText('Only a lead or engineer of this campaign adds or changes channels.')).toBeInTheDocument();
    expect(network.unhandled).toEqual([]);
  });

  it('explains an empty list, refuses a range upside down and shows the server’s 409 inline', async () => {
    const { user, network } = renderApp(`/campaigns/${campaignId}/channels`, {
      user: makeUser(),
      routes: {
        ...campaignRoutes(['engineer']),
        'GET /api/campaigns/:campaignId/channels': { body: [] },
        'POST /api/campaigns/:campaignId/channels': apiError(409, 'A channel named “Warm stream inlet temperature” already exists in this campaign'),
      },
    });

    expect(await screen.findByText('No channels yet')).toBeInTheDocument();
    expect(screen.getByText(/A channel is one instrument display/)).toBeInTheDocument();
    await user.click(screen.getAllByRole('button', { name: /New channel/ })[0]);
    const dialog = await findDialog('New channel');

    await user.type(within(dialog).getByLabelText('Name'), 'Warm stream inlet temperature');
    await user.type(within(dialog).getByLabelText('Symbol'), 'T1');
    await user.type(within(dialog).getByLabelText('Quantity'), 'temperature');
    await user.type(within(dialog).getByLabelText('Unit on the display'), '°C');
    await user.type(within(dialog).getByLabelText('Resolution'), '0.1');
    await user.type(within(dialog).getByLabelText('Range from'), '200');
    await user.type(within(dialog).getByLabelText('Range to'), '-50');
    await user.click(within(dialog).getByRole('button', { name: 'Add channel' }));
    expect(await within(dialog).findByText('Range: the upper end must be above the lower end (200)')).toBeInTheDocument();
    expect(network.callsTo('POST /api/campaigns/:campaignId/channels')).toHaveLength(0);

    await user.clear(within(dialog).getByLabelText('Range from'));
    await user.type(within(dialog).getByLabelText('Range from'), '-50');
    await user.clear(within(dialog).getByLabelText('Range to'));
    await user.type(within(dialog).getByLabelText('Range to'), '200');
    await user.type(within(dialog).getByLabelText('± % of reading'), '0.2');
    await user.type(within(dialog).getByLabelText('+ digits'), '2');
    await user.click(within(dialog).getByRole('button', { name: 'Add channel' }));

    expect(
      await within(dialog).findByText('A channel named “Warm stream inlet temperature” already exists in this campaign'),
    ).toBeInTheDocument();
    const sent = network.callsTo('POST /api/campaigns/:campaignId/channels');
    expect(sent).toHaveLength(1);
    expect(sent[0].body).toEqual({
      name: 'Warm stream inlet temperature',
      symbol: 'T1',
      quantity: 'temperature',
      rawUnit: '°C',
      resolution: 0.1,
      rangeMin: -50,
      rangeMax: 200,
      fullScale: null,
      operatingMin: null,
      operatingMax: null,
      accuracy: { percentOfFullScale: null, percentOfReading: 0.2, digits: 2 },
      plausibleMin: null,
      plausibleMax: null,
    } satisfies CreateChannelRequest);
    // The modal stays open with what was typed, so nothing is lost.
    expect(within(dialog).getByLabelText('Name')).toHaveValue('Warm stream inlet temperature');
  });

  it('moves a channel down with the keyboard and saves the whole new order', async () => {
    let current = [t1, p1, f1];
    const { user, network } = renderApp(`/campaigns/${campaignId}/channels`, {
      user: makeUser(),
      routes: {
        ...campaignRoutes(['lead']),
        'GET /api/campaigns/:campaignId/channels': () => ({ body: current }),
        'PUT /api/campaigns/:campaignId/channels/order': ({ body }: StubRequest) => {
          const ids = (body as { channelIds: string[] }).channelIds;
          current = ids.map((id, position) => ({ ...[t1, p1, f1].find((c) => c.id === id)!, position }));
          return { body: current };
        },
      },
    });

    const down = await screen.findByRole('button', { name: 'Move T1 down' });
    expect(screen.getByRole('button', { name: 'Move T1 up' })).toBeDisabled();
    expect(screen.getByRole('button', { name: 'Move F1 down' })).toBeDisabled();
    down.focus();
    await user.keyboard('{Enter}');

    await waitFor(() => expect(network.callsTo('PUT /api/campaigns/:campaignId/channels/order')).toHaveLength(1));
    expect(network.callsTo('PUT /api/campaigns/:campaignId/channels/order')[0].body).toEqual({ channelIds: [p1.id, t1.id, f1.id] });
    await waitFor(() => {
      const symbols = screen.getAllByRole('row').slice(1).map((row) => within(row).getAllByRole('cell')[1].textContent);
      expect(symbols).toEqual(['P1', 'T1', 'F1']);
    });
  });
});

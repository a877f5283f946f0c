import { describe, expect, it } from 'vitest';
import type { CampaignRole, Channel, DisplayRegion, SetDisplayRegionsRequest } from '@dialsheet/common';
import { fireEvent, renderApp, screen, waitFor } from '@/testing/test-utils';
import { makeCampaign, makeRecording, makeRun, makeUser } from '@/testing/fixtures';
import type { StubRequest } from '@/testing/fetch-stub';

const campaignId = '10000000-0000-4000-8000-000000000001';
const runId = '30000000-0000-4000-8000-0000000000d1';
const at = '2026-03-02T09:15:00.000Z';

function channel(id: string, symbol: string, name: string, position: number): Channel {
  return {
    id,
    campaignId,
    name,
    symbol,
    quantity: 'temperature',
    rawUnit: '°C',
    resolution: 0.1,
    rangeMin: 0,
    rangeMax: 100,
    fullScale: null,
    operatingMin: null,
    operatingMax: null,
    accuracy: null,
    plausibleMin: null,
    plausibleMax: null,
    position,
    createdAt: at,
    updatedAt: at,
  };
}

const t1 = channel('50000000-0000-4000-8000-000000000001', 'T1', 'Warm inlet', 0);
const t2 = channel('50000000-0000-4000-8000-000000000002', 'T2', 'Warm outlet', 1);

function renderRunPage(roles: CampaignRole[], regions: DisplayRegion[]) {
  const recording = makeRecording({ runId });
  const run = makeRun({ id: runId, recording });
  let stored = regions;
  return renderApp(`/campaigns/${campaignId}/runs/${runId}`, {
    user: makeUser(),
    routes: {
      'GET /api/campaigns': { body: [makeCampaign({ myRoles: roles })] },
      'GET /api/campaigns/:campaignId': { body: makeCampaign({ myRoles: roles }) },
      'GET /api/runs/:runId': { body: run },
      'GET /api/runs/:runId/recording': { body: recording },
      'GET /api/campaigns/:campaignId/channels': { body: [t1, t2] },
      // The run page also lists the run's reading sheets, with member names.
      'GET /api/runs/:runId/sheets': { body: [] },
      'GET /api/campaigns/:campaignId/members': { body: [] },
      'GET /api/runs/:runId/display-regions': () => ({ body: stored }),
      'PUT /api/runs/:runId/display-regions': ({ body }: StubRequest) => {
        stored = (body as SetDisplayRegionsRequest).regions.map((r) => ({ runId, ...r }));
        return { body: stored };
      },
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
    },
  });
}

describe('display regions on the run page', () => {
  it('shows a reader the saved regions as outlines, with nothing to draw or save', async () => {
    const { network } = renderRunPage(['reader'], [{ runId, channelId: t1.id, x: 0.1, y: 0.2, width: 0.2, height: 0.1 }]);
    const outline = await screen.findByTestId('region-T1');
    expect(outline).toHaveTextContent('T1');
    expect(outline.style.left).toBe('10%');
    expect(screen.getByTestId('region-overlay').style.pointerEvents).toBe('none');
    expect(screen.queryByText('Display regions')).not.toBeInTheDocument();
    expect(screen.queryByRole('combobox', { name: 'Channel to draw' })).not.toBeInTheDocument();
    expect(network.unhandled).toEqual([]);
  });

  it('lets an engineer pick a channel, drag round its display and save the fractions', async () => {
    const { user, network } = renderRunPage(['engineer'], []);
    await screen.findByText('Display regions');
    await user.click(screen.getByRole('combobox', { name: 'Channel to draw' }));
    const option = await waitFor(() => {
      const found = document.querySelector<HTMLElement>('.ant-select-item-option[title="T2 · Warm outlet"]');
      if (!found) throw new Error('no option yet');
      return found;
    });
    await user.click(option);

    const overlay = screen.getByTestId('region-overlay');
    await waitFor(() => expect(overlay.style.pointerEvents).toBe('auto'));
    // A 1000 × 360 screen: the 640 × 360 picture has 180 px bars at either side.
    overlay.getBoundingClientRect = () =>
      ({ left: 0, top: 0, width: 1000, height: 360, right: 1000, bottom: 360, x: 0, y: 0, toJSON: () => ({}) }) as DOMRect;
    fireEvent.pointerDown(overlay, { pointerId: 7, button: 0, clientX: 180 + 64, clientY: 36 });
    fireEvent.pointerMove(overlay, { pointerId: 7, clientX: 180 + 192, clientY: 108 });
    fireEvent.pointerUp(overlay, { pointerId: 7, clientX: 180 + 192, clientY: 108 });

    expect(await screen.findByTestId('region-T2')).toBeInTheDocument();
    await user.click(screen.getByRole('button', { name: /Save regions/ }));
    await waitFor(() => expect(network.callsTo('PUT /api/runs/:runId/display-regions')).toHaveLength(1));
    expect(network.callsTo('PUT /api/runs/:runId/display-regions')[0].body).toEqual({
      regions: [{ channelId: t2.id, x: 0.1, y: 0.1, width: 0.2, height: 0.2 }],
    });
    await waitFor(() => expect(screen.queryByRole('button', { name: /Save regions/ })).not.toBeInTheDocument());
    expect(network.unhandled).toEqual([]);
  });
});

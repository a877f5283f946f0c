import { describe, expect, it } from 'vitest';
import type { Campaign, CreateCampaignRequest } from '@dialsheet/common';
import { findDialog, renderApp, screen, within } from '@/testing/test-utils';
import { makeCampaign, makeUser } from '@/testing/fixtures';
import type { StubRequest } from '@/testing/fetch-stub';

describe('campaign list', () => {
  it('explains an empty list, creates a campaign and opens it', async () => {
    const created: Campaign[] = [];
    const { user, network, router } = renderApp('/campaigns', {
      user: makeUser(),
      routes: {
        'GET /api/campaigns': () => ({ body: created }),
        'POST /api/campaigns': ({ body }: StubRequest) => {
          const request = body as CreateCampaignRequest;
          const campaign = makeCampaign({ id: 'c0ffee00-0000-4000-8000-000000000001', name: request.name, memberCount: 1 });
          created.push(campaign);
          return { status: 201, body: campaign };
        },
        'GET /api/campaigns/:campaignId': ({ params }: StubRequest) => ({
          body: created.find((c) => c.id === params.campaignId),
        }),
      },
    });

    expect(await screen.findByText('No campaigns yet')).toBeInTheDocument();

    const newButtons = screen.getAllByRole('button', { name: /New campaign/ });
    await user.click(newButtons[0]);
    const dialog = await findDialog('New campaign');
    await user.click(within(dialog).getByRole('button', { name: 'Create campaign' }));
    expect(await within(dialog).findByText('Give the campaign a name')).toBeInTheDocument();
    expect(network.callsTo('POST /api/campaigns')).toHaveLength(0);

    await user.type(within(dialog).getByLabelText('Name'), '  Cross-flow core, summer  ');
    await user.type(within(dialog).getByLabelText('Description'), 'Second build of the core.');
    await user.click(within(dialog).getByRole('button', { name: 'Create campaign' }));

    expect(await screen.findByRole('heading', { name: /Cross-flow core, summer/ })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/campaigns/c0ffee00-0000-4000-8000-000000000001');
    expect(network.callsTo('POST /api/campaigns')[0].body).toEqual({
      name: 'Cross-flow core, summer',
      description: 'Second build of the core.',
      decimalComma: false,
    });
    // The overview carries the rig-safety caution.
    expect(screen.getByText(/hot surfaces and pressurised/)).toBeInTheDocument();
    expect(network.unhandled).toEqual([]);
  });

  it('lists campaigns with the roles I hold', async () => {
    renderApp('/campaigns', {
      user: makeUser(),
      routes: {
        'GET /api/campaigns': {
          body: [makeCampaign({ name: 'Core bench test', myRoles: ['checker', 'engineer'], memberCount: 7 })],
        },
      },
    });
    const row = (await screen.findByRole('link', { name: 'Core bench test' })).closest('tr');
    expect(row).not.toBeNull();
    expect(within(row!).getByText('Checker')).toBeInTheDocument();
    expect(within(row!).getByText('Engineer')).toBeInTheDocument();
    expect(within(row!).getByText('7')).toBeInTheDocument();
  });
});

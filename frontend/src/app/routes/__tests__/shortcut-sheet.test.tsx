import { describe, expect, it } from 'vitest';
import { findDialog, renderApp, screen, waitFor, within } from '@/testing/test-utils';
import { makeCampaign, makeUser } from '@/testing/fixtures';

function renderSignedIn(url: string) {
  return renderApp(url, {
    user: makeUser(),
    routes: { 'GET /api/campaigns': { body: [makeCampaign()] } },
  });
}

describe('keyboard shortcut sheet', () => {
  it('opens on ? and lists the shortcuts', async () => {
    const { user } = renderSignedIn('/campaigns');
    await screen.findByRole('heading', { name: 'Campaigns' });

    await user.keyboard('?');

    const sheet = await findDialog('Keyboard shortcuts');
    expect(within(sheet).getByText('Show this list of shortcuts')).toBeInTheDocument();
    expect(within(sheet).getByText('Campaigns')).toBeInTheDocument();
  });

  it('stays closed while typing in a field, where ? is just a character', async () => {
    const { user } = renderSignedIn('/campaigns');
    await screen.findByRole('heading', { name: 'Campaigns' });
    await user.click(screen.getAllByRole('button', { name: /New campaign/ })[0]);
    const nameField = within(await findDialog('New campaign')).getByLabelText('Name');

    await user.type(nameField, 'Why?');

    expect(nameField).toHaveValue('Why?');
    expect(screen.queryByText('Show this list of shortcuts')).not.toBeInTheDocument();
  });

  it('goes to campaigns with g then c', async () => {
    const { user, router } = renderSignedIn('/account');
    await screen.findByRole('heading', { name: 'Your account' });

    await user.keyboard('gc');

    await waitFor(() => expect(router.state.location.pathname).toBe('/campaigns'));
    expect(await screen.findByRole('heading', { name: 'Campaigns' })).toBeInTheDocument();
  });
});

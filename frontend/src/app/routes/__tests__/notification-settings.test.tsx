import { describe, expect, it } from 'vitest';
import type { NotificationSettings } from '@dialsheet/common';
import { renderApp, screen, waitFor } from '@/testing/test-utils';
import { makeCampaign, makeUser } from '@/testing/fixtures';
import { apiError, type StubRequest, type StubRoutes } from '@/testing/fetch-stub';
import { makeNotificationSettings } from '@/features/releases/testing/release-fixtures';

function renderAccount(routes: StubRoutes) {
  return renderApp('/account', {
    user: makeUser(),
    routes: { 'GET /api/campaigns': { body: [makeCampaign()] }, ...routes },
  });
}

describe('notification settings on the account page', () => {
  it('shows a switch per kind and saves a switched kind at once', async () => {
    const stored = makeNotificationSettings({ 'pass-finished': false });
    const { user, network } = renderAccount({
      'GET /api/users/me/notifications': { body: stored },
      'PUT /api/users/me/notifications': ({ body }: StubRequest) => ({ body }),
    });
    const release = await screen.findByRole('switch', { name: 'A release of my campaign is published' }, { timeout: 20_000 });
    expect(release).toBeChecked();
    expect(screen.getByRole('switch', { name: 'A pass of a sheet I oversee is finished' })).not.toBeChecked();
    expect(screen.getByRole('switch', { name: 'A sheet is assigned to me' })).toBeChecked();
    expect(screen.getByRole('switch', { name: 'Mismatches wait for my resolution' })).toBeChecked();

    await user.click(release);
    await waitFor(() => expect(network.callsTo('PUT /api/users/me/notifications')).toHaveLength(1));
    // Only the switched kind changes; the others go back as stored.
    expect(network.callsTo('PUT /api/users/me/notifications')[0].body).toEqual({ ...stored, 'release-published': false } satisfies NotificationSettings);
    expect(await screen.findByText('Off: a release of my campaign is published')).toBeInTheDocument();
    await waitFor(() => expect(screen.getByRole('switch', { name: 'A release of my campaign is published' })).not.toBeChecked());
  });

  it('keeps the stored choice when the server refuses a change', async () => {
    const { user, network } = renderAccount({
      'GET /api/users/me/notifications': { body: makeNotificationSettings() },
      'PUT /api/users/me/notifications': apiError(400, 'unknown notification kind'),
    });
    const assigned = await screen.findByRole('switch', { name: 'A sheet is assigned to me' }, { timeout: 20_000 });
    await user.click(assigned);
    await waitFor(() => expect(network.callsTo('PUT /api/users/me/notifications')).toHaveLength(1));
    expect(await screen.findByText('unknown notification kind')).toBeInTheDocument();
    expect(screen.getByRole('switch', { name: 'A sheet is assigned to me' })).toBeChecked();
  });
});

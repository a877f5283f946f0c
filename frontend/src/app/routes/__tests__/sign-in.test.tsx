import { describe, expect, it } from 'vitest';
import type { LoginResponse } from '@dialsheet/common';
import { renderApp, screen } from '@/testing/test-utils';
import { apiError } from '@/testing/fetch-stub';
import { makeUser } from '@/testing/fixtures';
import { authToken } from '@/lib/auth-token';

async function fillAndSubmit(user: ReturnType<typeof renderApp>['user'], email: string, password: string) {
  await user.type(await screen.findByLabelText('E-mail'), email);
  await user.type(screen.getByLabelText('Password'), password);
  await user.click(screen.getByRole('button', { name: 'Sign in' }));
}

describe('sign-in page', () => {
  it("shows the server's message when the password is wrong and keeps no token", async () => {
    const { user, network } = renderApp('/sign-in', {
      routes: { 'POST /api/auth/login': apiError(401, 'E-mail or password is wrong') },
    });

    await fillAndSubmit(user, 'lena.lead@example.org', 'not-the-password');

    expect(await screen.findByRole('alert')).toHaveTextContent('E-mail or password is wrong');
    expect(window.localStorage.getItem('dialsheet.accessToken')).toBeNull();
    expect(network.callsTo('POST /api/auth/login')[0].body).toEqual({
      email: 'lena.lead@example.org',
      password: 'not-the-password',
    });
    expect(screen.getByRole('button', { name: 'Sign in' })).toBeEnabled();
  });

  it('stores the token on success, opens the page asked for and sends the token afterwards', async () => {
    const session: LoginResponse = { accessToken: 'token-from-server', expiresIn: 43200, user: makeUser() };
    const { user, network } = renderApp('/sign-in?next=%2Fcampaigns%3Fstatus%3Darchived', {
      routes: {
        'POST /api/auth/login': { body: session },
        'GET /api/campaigns': { body: [] },
      },
    });

    await fillAndSubmit(user, 'lena.lead@example.org', 'correct horse battery');

    expect(await screen.findByRole('heading', { name: 'Campaigns' })).toBeInTheDocument();
    expect(window.localStorage.getItem('dialsheet.accessToken')).toBe('token-from-server');
    expect(await screen.findByText('No archived campaigns')).toBeInTheDocument();
    const listCalls = network.callsTo('GET /api/campaigns');
    expect(listCalls.some((c) => c.query.get('status') === 'archived')).toBe(true);
    expect(listCalls.every((c) => c.headers.get('Authorization') === 'Bearer token-from-server')).toBe(true);
  });

  it('sends a signed-out visitor of a private page to sign-in and remembers where they were going', async () => {
    const { router } = renderApp('/campaigns/abc/members');
    expect(await screen.findByRole('button', { name: 'Sign in' })).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/campaigns/abc/members')}`);
  });

  it('drops a token the server no longer accepts and asks to sign in again, keeping the destination', async () => {
    window.localStorage.setItem('dialsheet.accessToken', 'revoked-token');
    authToken.reloadFromStorage();
    const { router } = renderApp('/campaigns/abc', {
      routes: { 'GET /api/auth/me': apiError(401, 'Unauthorized') },
    });

    expect(await screen.findByText(/Your session has ended/)).toBeInTheDocument();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?next=${encodeURIComponent('/campaigns/abc')}`);
    expect(window.localStorage.getItem('dialsheet.accessToken')).toBeNull();
  });
});

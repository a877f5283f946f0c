import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { RouterProvider, createMemoryRouter } from 'react-router-dom';
import { StyleProvider } from '@ant-design/cssinjs';
import type { User } from '@dialsheet/common';
import { AppProvider } from '@/app/provider';
import { createAppRoutes } from '@/app/router';
import { authToken } from '@/lib/auth-token';
import { createQueryClient } from '@/lib/query-client';
import { stubFetch, type StubRoutes } from './fetch-stub';

export const TEST_TOKEN = 'test-access-token';

// antd writes its styles into <style> tags; jsdom re-reads every rule on each getComputedStyle,
// which makes role queries crawl. Tests assert structure and text, not looks, so the styles go
// into a container outside the document.
const detachedStyles = document.createElement('div');

interface RenderAppOptions {
  /** Signed in as this person (a token is stored and GET /api/auth/me answers with them). */
  user?: User | null;
  routes?: StubRoutes;
}

/** Renders the whole app (real routes, providers, API client) at a URL, with fetch stubbed. */
export function renderApp(url: string, { user = null, routes = {} }: RenderAppOptions = {}) {
  if (user) authToken.set(TEST_TOKEN);
  const network = stubFetch({ ...(user ? { 'GET /api/auth/me': { body: user } } : {}), ...routes });
  const queryClient = createQueryClient();
  const router = createMemoryRouter(createAppRoutes(queryClient), { initialEntries: [url] });
  const view = render(
    <StyleProvider container={detachedStyles}>
      <AppProvider queryClient={queryClient}>
        <RouterProvider router={router} />
      </AppProvider>
    </StyleProvider>,
  );
  return { ...view, router, queryClient, network, user: userEvent.setup() };
}

export * from '@testing-library/react';

/**
 * Finds an open antd dialog by its title. (In tests antd gives every generated id the same
 * value, so a dialog's aria-labelledby cannot be used to name it.)
 */
export async function findDialog(title: string): Promise<HTMLElement> {
  return waitFor(() => {
    const dialog = screen
      .getAllByRole('dialog')
      .find((candidate) => candidate.querySelector('.ant-modal-title')?.textContent === title);
    if (!dialog) throw new Error(`No open dialog titled "${title}"`);
    return dialog as HTMLElement;
  });
}

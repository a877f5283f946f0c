import { describe, expect, it } from 'vitest';
import { renderApp, screen } from '@/testing/test-utils';

describe('404 page', () => {
  it('answers an unknown address with a not-found page and a way back', async () => {
    const { network } = renderApp('/no/such/page');
    expect(await screen.findByRole('heading', { name: 'Page not found' })).toBeInTheDocument();
    expect(screen.getByRole('link', { name: /Go to your campaigns/ })).toHaveAttribute('href', '/campaigns');
    expect(document.title).toBe('Page not found · Dialsheet');
    expect(network.calls).toHaveLength(0);
  });
});

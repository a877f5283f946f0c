import { describe, expect, it } from 'vitest';
import { render, screen } from '@testing-library/react';
import { LinkedText, splitLinks } from './linked-text';

describe('splitLinks', () => {
  it('finds web addresses and leaves sentence punctuation outside them', () => {
    expect(splitLinks('Open http://127.0.0.1:3000/invitations/accept?token=abc-DEF_1. Thanks')).toEqual([
      { kind: 'text', value: 'Open ' },
      { kind: 'link', value: 'http://127.0.0.1:3000/invitations/accept?token=abc-DEF_1' },
      { kind: 'text', value: '. Thanks' },
    ]);
  });

  it('returns plain text untouched when there is no address', () => {
    expect(splitLinks('No links here.')).toEqual([{ kind: 'text', value: 'No links here.' }]);
  });
});

describe('LinkedText', () => {
  it('makes addresses clickable and never renders markup from the message', () => {
    const { container } = render(
      <LinkedText text={'<b>bold?</b> see https://example.org/reset-password/confirm?token=xyz'} />,
    );
    const link = screen.getByRole('link');
    expect(link).toHaveAttribute('href', 'https://example.org/reset-password/confirm?token=xyz');
    expect(link).toHaveAttribute('rel', 'noopener noreferrer');
    expect(container.querySelector('b')).toBeNull();
    expect(container.textContent).toContain('<b>bold?</b>');
  });

  it('opens links to this app in the same tab', () => {
    render(<LinkedText text={`${window.location.origin}/invitations/accept?token=t1`} />);
    expect(screen.getByRole('link')).not.toHaveAttribute('target');
  });
});

import { describe, expect, it, vi } from 'vitest';
import { render } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { isTypingTarget, useKeySequences, type KeyBinding } from './use-key-sequences';

function Harness({ bindings }: { bindings: KeyBinding[] }) {
  useKeySequences(bindings);
  return (
    <div>
      <input aria-label="text" />
      <input aria-label="tick" type="checkbox" />
    </div>
  );
}

describe('isTypingTarget', () => {
  it('counts text fields and editable areas as typing, checkboxes and buttons not', () => {
    const text = document.createElement('input');
    const box = Object.assign(document.createElement('input'), { type: 'checkbox' });
    const area = document.createElement('textarea');
    const button = document.createElement('button');
    expect(isTypingTarget(text)).toBe(true);
    expect(isTypingTarget(area)).toBe(true);
    expect(isTypingTarget(box)).toBe(false);
    expect(isTypingTarget(button)).toBe(false);
  });
});

describe('useKeySequences', () => {
  it('runs a two-key sequence, ignores it inside a text field, and ignores modifier chords', async () => {
    const user = userEvent.setup();
    const goCampaigns = vi.fn();
    const { getByLabelText } = render(<Harness bindings={[{ keys: ['g', 'c'], run: goCampaigns }]} />);

    await user.keyboard('gc');
    expect(goCampaigns).toHaveBeenCalledTimes(1);

    await user.click(getByLabelText('text'));
    await user.keyboard('gc');
    expect(goCampaigns).toHaveBeenCalledTimes(1);

    await user.click(getByLabelText('tick'));
    await user.keyboard('{Control>}g{/Control}c');
    expect(goCampaigns).toHaveBeenCalledTimes(1);
    await user.keyboard('gc');
    expect(goCampaigns).toHaveBeenCalledTimes(2);
  });

  it('forgets a lone first key after a different key', async () => {
    const user = userEvent.setup();
    const run = vi.fn();
    render(<Harness bindings={[{ keys: ['g', 'c'], run }]} />);
    await user.keyboard('gxc');
    expect(run).not.toHaveBeenCalled();
  });
});

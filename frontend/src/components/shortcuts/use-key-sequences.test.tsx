import { describe, expect, it, vi } from 'vitest';
import { render } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { controlOwnsKey, isTypingTarget, useKeySequences, type KeyBinding } from './use-key-sequences';

function Harness({ bindings }: { bindings: KeyBinding[] }) {
  useKeySequences(bindings);
  return (
    <div>
      <input aria-label="text" />
      <input aria-label="tick" type="checkbox" />
      <button type="button">press</button>
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

describe('keys a focused control uses itself', () => {
  it('leaves Space and Enter to buttons and links, arrows to sliders and radios', () => {
    const button = document.createElement('button');
    const link = document.createElement('a');
    const slider = document.createElement('div');
    slider.setAttribute('role', 'slider');
    const radio = Object.assign(document.createElement('input'), { type: 'radio' });
    const plain = document.createElement('div');
    expect(controlOwnsKey(button, ' ')).toBe(true);
    expect(controlOwnsKey(link, 'Enter')).toBe(true);
    expect(controlOwnsKey(button, 'ArrowRight')).toBe(false);
    expect(controlOwnsKey(slider, 'ArrowLeft')).toBe(true);
    expect(controlOwnsKey(radio, 'ArrowDown')).toBe(true);
    expect(controlOwnsKey(plain, ' ')).toBe(false);
  });
});

describe('Shift in bindings', () => {
  it('tells a key from Shift + key when a binding asks, and ignores Shift when it does not', async () => {
    const user = userEvent.setup();
    const step = vi.fn();
    const jump = vi.fn();
    const help = vi.fn();
    render(
      <Harness
        bindings={[
          { keys: ['ArrowRight'], shift: false, run: step },
          { keys: ['ArrowRight'], shift: true, run: jump },
          { keys: ['?'], run: help },
        ]}
      />,
    );
    await user.keyboard('{ArrowRight}{Shift>}{ArrowRight}{/Shift}?');
    expect(step).toHaveBeenCalledTimes(1);
    expect(jump).toHaveBeenCalledTimes(1);
    expect(help).toHaveBeenCalledTimes(1);
  });

  it('lets Space press a focused button rather than run a shortcut', async () => {
    const user = userEvent.setup();
    const space = vi.fn();
    const { getByRole } = render(<Harness bindings={[{ keys: [' '], run: space }]} />);
    await user.keyboard(' ');
    expect(space).toHaveBeenCalledTimes(1);
    await user.click(getByRole('button', { name: 'press' }));
    await user.keyboard(' ');
    expect(space).toHaveBeenCalledTimes(1);
  });
});

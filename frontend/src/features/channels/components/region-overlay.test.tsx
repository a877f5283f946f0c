import { describe, expect, it, vi } from 'vitest';
import { fireEvent, render, screen } from '@testing-library/react';
import type { Channel } from '@dialsheet/common';
import { RegionOverlay } from './region-overlay';

const channel = { id: 'c1', symbol: 'T1', name: 'Inlet temperature' } as Channel;
const other = { id: 'c2', symbol: 'P1', name: 'Supply pressure' } as Channel;

/** jsdom lays nothing out: give the overlay the box a wide player would have (bars left and right). */
function placeOverlay(): HTMLElement {
  const overlay = screen.getByTestId('region-overlay');
  overlay.getBoundingClientRect = () =>
    ({ left: 100, top: 50, width: 1000, height: 360, right: 1100, bottom: 410, x: 100, y: 50, toJSON: () => ({}) }) as DOMRect;
  return overlay;
}

function drag(overlay: HTMLElement, from: [number, number], to: [number, number]) {
  fireEvent.pointerDown(overlay, { pointerId: 1, button: 0, clientX: from[0], clientY: from[1] });
  fireEvent.pointerMove(overlay, { pointerId: 1, clientX: to[0], clientY: to[1] });
  fireEvent.pointerUp(overlay, { pointerId: 1, clientX: to[0], clientY: to[1] });
}

describe('RegionOverlay', () => {
  it('turns a drag into fractions of the picture for the picked channel', () => {
    const onDraw = vi.fn();
    render(<RegionOverlay channels={[channel]} regions={[]} frameSize={{ width: 640, height: 360 }} activeChannelId="c1" onDraw={onDraw} />);
    // The 640 × 360 picture sits 180 px in from the box's left edge; the box is 100 px in from the page's.
    drag(placeOverlay(), [100 + 180 + 128, 50 + 90], [100 + 180 + 320, 50 + 270]);
    expect(onDraw).toHaveBeenCalledWith('c1', { x: 0.2, y: 0.25, width: 0.3, height: 0.5 });
  });

  it('drops the drag on Escape', () => {
    const onDraw = vi.fn();
    render(<RegionOverlay channels={[channel]} regions={[]} frameSize={{ width: 640, height: 360 }} activeChannelId="c1" onDraw={onDraw} />);
    const overlay = placeOverlay();
    fireEvent.pointerDown(overlay, { pointerId: 1, button: 0, clientX: 400, clientY: 100 });
    fireEvent.pointerMove(overlay, { pointerId: 1, clientX: 600, clientY: 300 });
    fireEvent.keyDown(window, { key: 'Escape' });
    fireEvent.pointerUp(overlay, { pointerId: 1, clientX: 600, clientY: 300 });
    expect(onDraw).not.toHaveBeenCalled();
  });

  it('shows saved regions as labelled outlines and draws nothing when read-only', () => {
    const onDraw = vi.fn();
    render(
      <RegionOverlay
        channels={[channel, other]}
        regions={[
          { channelId: 'c1', x: 0.1, y: 0.2, width: 0.25, height: 0.1 },
          { channelId: 'c2', x: 0.5, y: 0.5, width: 0.2, height: 0.2 },
        ]}
        frameSize={{ width: 640, height: 360 }}
      />,
    );
    const outline = screen.getByTestId('region-T1');
    expect(outline).toHaveTextContent('T1');
    expect(outline.style.left).toBe('10%');
    expect(outline.style.top).toBe('20%');
    expect(outline.style.width).toBe('25%');
    expect(screen.getByTestId('region-P1')).toHaveTextContent('P1');
    const overlay = placeOverlay();
    expect(overlay.style.pointerEvents).toBe('none');
    drag(overlay, [400, 100], [600, 300]);
    expect(onDraw).not.toHaveBeenCalled();
  });
});

import { useEffect, useRef, useState, type PointerEvent as ReactPointerEvent } from 'react';
import type { Channel, DisplayRegionInput } from '@dialsheet/common';
import { containedPicture, dragToRegion, type Point, type Rect, type Size } from '../utils/region-geometry';

interface RegionOverlayProps {
  channels: Channel[];
  regions: DisplayRegionInput[];
  /** Size of the video's picture (px of the file), to find it inside the letterboxed player. */
  frameSize: Size | null;
  /** The channel a drag draws for; null (or read-only) leaves the player free to use. */
  activeChannelId?: string | null;
  onDraw?: (channelId: string, region: Rect) => void;
}

interface Drag {
  pointerId: number;
  start: Point;
  end: Point;
}

const percent = (fraction: number) => `${fraction * 100}%`;

/**
 * Sits over the player's picture, the same size as the player's screen: shows each channel's
 * region as a labelled outline and, while a channel is picked, turns a drag into its region.
 */
export function RegionOverlay({ channels, regions, frameSize, activeChannelId = null, onDraw }: RegionOverlayProps) {
  const boxRef = useRef<HTMLDivElement>(null);
  const [box, setBox] = useState<Size>({ width: 0, height: 0 });
  const [drag, setDrag] = useState<Drag | null>(null);
  const drawing = activeChannelId !== null && onDraw !== undefined;

  // The outlines follow the player's size (window resizes, the side column folding under).
  useEffect(() => {
    const element = boxRef.current;
    if (!element) return undefined;
    const measure = () => setBox({ width: element.clientWidth, height: element.clientHeight });
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(element);
    return () => observer.disconnect();
  }, []);

  // Escape drops a drag in progress without changing anything.
  useEffect(() => {
    if (!drag) return undefined;
    const onKey = (event: KeyboardEvent) => {
      if (event.key !== 'Escape') return;
      event.preventDefault();
      event.stopPropagation();
      setDrag(null);
    };
    window.addEventListener('keydown', onKey, true);
    return () => window.removeEventListener('keydown', onKey, true);
  }, [drag]);

  // A channel set down mid-drag (or read-only again) ends the drag.
  useEffect(() => {
    if (!drawing) setDrag(null);
  }, [drawing]);

  const pointIn = (event: ReactPointerEvent<HTMLDivElement>): { point: Point; picture: Rect } => {
    const bounds = event.currentTarget.getBoundingClientRect();
    return {
      point: { x: event.clientX - bounds.left, y: event.clientY - bounds.top },
      picture: containedPicture({ width: bounds.width, height: bounds.height }, frameSize),
    };
  };

  const onPointerDown = (event: ReactPointerEvent<HTMLDivElement>) => {
    if (!drawing || event.button !== 0) return;
    event.preventDefault();
    event.currentTarget.setPointerCapture?.(event.pointerId);
    const { point } = pointIn(event);
    setDrag({ pointerId: event.pointerId, start: point, end: point });
  };

  const onPointerMove = (event: ReactPointerEvent<HTMLDivElement>) => {
    if (!drag || event.pointerId !== drag.pointerId) return;
    const { point } = pointIn(event);
    setDrag({ ...drag, end: point });
  };

  const onPointerUp = (event: ReactPointerEvent<HTMLDivElement>) => {
    if (!drag || event.pointerId !== drag.pointerId) return;
    const { point, picture } = pointIn(event);
    setDrag(null);
    const region = dragToRegion(drag.start, point, picture);
    if (region && activeChannelId !== null) onDraw?.(activeChannelId, region);
  };

  const picture = containedPicture(box, frameSize);
  const preview = drag ? dragToRegion(drag.start, drag.end, picture) : null;
  const byId = new Map(channels.map((c) => [c.id, c]));

  return (
    <div
      ref={boxRef}
      className={`region-overlay${drawing ? ' is-drawing' : ''}`}
      data-testid="region-overlay"
      style={{ position: 'absolute', inset: 0, pointerEvents: drawing ? 'auto' : 'none', touchAction: drawing ? 'none' : undefined }}
      onPointerDown={onPointerDown}
      onPointerMove={onPointerMove}
      onPointerUp={onPointerUp}
      onPointerCancel={() => setDrag(null)}
    >
      <div
        className="region-overlay-picture"
        style={{ position: 'absolute', left: picture.x, top: picture.y, width: picture.width, height: picture.height }}
      >
        {regions.map((region) => {
          const channel = byId.get(region.channelId);
          if (!channel) return null;
          const active = region.channelId === activeChannelId;
          return (
            <div
              key={region.channelId}
              className={`region-outline${active ? ' is-active' : ''}`}
              data-testid={`region-${channel.symbol}`}
              style={{ position: 'absolute', left: percent(region.x), top: percent(region.y), width: percent(region.width), height: percent(region.height) }}
            >
              <span className="region-label">{channel.symbol}</span>
            </div>
          );
        })}
        {preview ? (
          <div
            className="region-outline is-preview"
            style={{ position: 'absolute', left: percent(preview.x), top: percent(preview.y), width: percent(preview.width), height: percent(preview.height) }}
          />
        ) : null}
      </div>
    </div>
  );
}

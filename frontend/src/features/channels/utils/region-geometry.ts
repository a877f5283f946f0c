// Regions are stored as fractions (0–1) of the displayed picture, so they hold whatever size the
// player is drawn at. The player letterboxes the picture inside its box (object-fit: contain),
// so pointer positions are first taken relative to the picture, not to the box.

export interface Size {
  width: number;
  height: number;
}

export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface Point {
  x: number;
  y: number;
}

/** Where a picture of `frame` size sits inside a box of `box` size with object-fit: contain (px). */
export function containedPicture(box: Size, frame: Size | null): Rect {
  if (!frame || frame.width <= 0 || frame.height <= 0 || box.width <= 0 || box.height <= 0) {
    return { x: 0, y: 0, width: Math.max(box.width, 0), height: Math.max(box.height, 0) };
  }
  const scale = Math.min(box.width / frame.width, box.height / frame.height);
  const width = frame.width * scale;
  const height = frame.height * scale;
  return { x: (box.width - width) / 2, y: (box.height - height) / 2, width, height };
}

function clamp01(value: number): number {
  return Math.min(Math.max(value, 0), 1);
}

/** A point in the box (px) as a fraction of the picture, held to the picture's edges. */
export function toFraction(point: Point, picture: Rect): Point {
  if (picture.width <= 0 || picture.height <= 0) return { x: 0, y: 0 };
  return { x: clamp01((point.x - picture.x) / picture.width), y: clamp01((point.y - picture.y) / picture.height) };
}

/** Regions smaller than this (a fraction of the picture's side) are a slip of the mouse, not a display. */
export const MIN_REGION_FRACTION = 0.005;

/**
 * A drag from `start` to `end` (px in the box, either direction) as a region in fractions of the
 * picture, clipped to the picture; null when it is too small to be a display.
 */
export function dragToRegion(start: Point, end: Point, picture: Rect): Rect | null {
  const a = toFraction(start, picture);
  const b = toFraction(end, picture);
  const x = Math.min(a.x, b.x);
  const y = Math.min(a.y, b.y);
  const width = Math.min(Math.abs(b.x - a.x), 1 - x);
  const height = Math.min(Math.abs(b.y - a.y), 1 - y);
  if (width < MIN_REGION_FRACTION || height < MIN_REGION_FRACTION) return null;
  return { x: round(x), y: round(y), width: round(width), height: round(height) };
}

/** Six decimals is a hundredth of a pixel on an 8K frame; more only carries float noise. */
function round(value: number): number {
  return Math.round(value * 1e6) / 1e6;
}

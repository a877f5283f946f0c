import { describe, expect, it } from 'vitest';
import { containedPicture, dragToRegion, toFraction } from './region-geometry';

describe('containedPicture', () => {
  it('fills a box of the same shape', () => {
    expect(containedPicture({ width: 640, height: 360 }, { width: 1920, height: 1080 })).toEqual({ x: 0, y: 0, width: 640, height: 360 });
  });

  it('centres a wide picture in a tall box (bars above and below)', () => {
    expect(containedPicture({ width: 400, height: 400 }, { width: 1600, height: 900 })).toEqual({ x: 0, y: 87.5, width: 400, height: 225 });
  });

  it('centres a picture in a box held short by a height limit (bars left and right)', () => {
    expect(containedPicture({ width: 1000, height: 360 }, { width: 640, height: 360 })).toEqual({ x: 180, y: 0, width: 640, height: 360 });
  });

  it('uses the whole box when the frame size is unknown', () => {
    expect(containedPicture({ width: 300, height: 200 }, null)).toEqual({ x: 0, y: 0, width: 300, height: 200 });
  });
});

describe('dragToRegion', () => {
  const picture = { x: 180, y: 0, width: 640, height: 360 };

  it('turns a drag into fractions of the picture, not of the box', () => {
    // From (20 %, 25 %) to (50 %, 75 %) of the picture.
    expect(dragToRegion({ x: 180 + 128, y: 90 }, { x: 180 + 320, y: 270 }, picture)).toEqual({ x: 0.2, y: 0.25, width: 0.3, height: 0.5 });
  });

  it('gives the same region for a drag up and to the left', () => {
    expect(dragToRegion({ x: 180 + 320, y: 270 }, { x: 180 + 128, y: 90 }, picture)).toEqual({ x: 0.2, y: 0.25, width: 0.3, height: 0.5 });
  });

  it('clips a drag that leaves the picture to its edges', () => {
    expect(dragToRegion({ x: 180 + 480, y: 180 }, { x: 990, y: 500 }, picture)).toEqual({ x: 0.75, y: 0.5, width: 0.25, height: 0.5 });
    expect(dragToRegion({ x: 0, y: -40 }, { x: 180 + 64, y: 36 }, picture)).toEqual({ x: 0, y: 0, width: 0.1, height: 0.1 });
  });

  it('ignores a click without a drag', () => {
    expect(dragToRegion({ x: 300, y: 100 }, { x: 301, y: 100 }, picture)).toBeNull();
  });

  it('keeps a point on the bars at the nearest picture edge', () => {
    expect(toFraction({ x: 10, y: 400 }, picture)).toEqual({ x: 0, y: 1 });
  });
});

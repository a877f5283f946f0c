import type { DisplayRegion } from '@dialsheet/common';

/** Height of a crop on screen (CSS px); the width follows the region's shape. */
const CROP_HEIGHT = 64;
const CROP_MAX_WIDTH = 260;

/**
 * Draws one display region of the frame on screen (the <video>, or one copy of its frame) into
 * its canvas, enlarged. Regions are fractions
 * of the picture as shown, which is what videoWidth × videoHeight describe (rotation applied).
 * Returns false when there is nothing to draw yet (no frame decoded, no 2D context).
 */
export function drawRegionCrop(canvas: HTMLCanvasElement, source: HTMLVideoElement | ImageBitmap, region: DisplayRegion): boolean {
  const vw = 'videoWidth' in source ? source.videoWidth : source.width;
  const vh = 'videoHeight' in source ? source.videoHeight : source.height;
  if (!vw || !vh) return false;
  const sx = region.x * vw;
  const sy = region.y * vh;
  const sw = Math.max(region.width * vw, 1);
  const sh = Math.max(region.height * vh, 1);
  const ratio = window.devicePixelRatio || 1;
  const cssWidth = Math.min(CROP_HEIGHT * (sw / sh), CROP_MAX_WIDTH);
  const cssHeight = cssWidth < CROP_HEIGHT * (sw / sh) ? cssWidth / (sw / sh) : CROP_HEIGHT;
  const width = Math.max(1, Math.round(cssWidth * ratio));
  const height = Math.max(1, Math.round(cssHeight * ratio));
  // Setting a canvas's size clears and reallocates it: only when the shape changes.
  if (canvas.width !== width || canvas.height !== height) {
    canvas.width = width;
    canvas.height = height;
    canvas.style.width = `${Math.round(cssWidth)}px`;
    canvas.style.height = `${Math.round(cssHeight)}px`;
  }
  let context: CanvasRenderingContext2D | null = null;
  try {
    context = canvas.getContext('2d');
  } catch {
    context = null;
  }
  if (!context) return false;
  context.imageSmoothingQuality = 'high';
  context.drawImage(source, sx, sy, sw, sh, 0, 0, width, height);
  return true;
}

export interface CropTarget {
  canvas: HTMLCanvasElement;
  region: DisplayRegion;
}

/**
 * Draws every crop from one copy of the frame. Each drawImage straight from a <video> copies the
 * whole decoded frame again, which without a GPU cost several milliseconds per display; one
 * createImageBitmap and six cuts from it cost about one. `stillCurrent` is asked once the copy is
 * ready, so a frame the reader has already stepped past is not drawn.
 */
export function drawRegionCrops(video: HTMLVideoElement, targets: readonly CropTarget[], stillCurrent: () => boolean): void {
  if (targets.length === 0 || !video.videoWidth) return;
  const direct = () => {
    if (stillCurrent()) for (const t of targets) drawRegionCrop(t.canvas, video, t.region);
  };
  if (typeof createImageBitmap !== 'function') {
    direct();
    return;
  }
  createImageBitmap(video).then(
    (bitmap) => {
      try {
        if (stillCurrent()) for (const t of targets) drawRegionCrop(t.canvas, bitmap, t.region);
      } finally {
        bitmap.close();
      }
    },
    direct,
  );
}

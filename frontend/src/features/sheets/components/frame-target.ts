import type { ReactNode } from 'react';

/** Which moment of the video to show beside a cell: the row's test time, or the frame a pass was read from. */
export interface FrameTarget {
  /** Test time of the row, seconds. */
  testTime: number;
  /** Video time of a particular frame (a pass's frameTime); null to show the row's own time. */
  videoTime: number | null;
}

/**
 * Draws the run's video at a moment. Passed in by the page, which owns the recording: a feature
 * does not reach into another feature's player.
 */
export type RenderFrame = (target: FrameTarget) => ReactNode;

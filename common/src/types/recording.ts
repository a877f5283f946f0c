// A recording is the video of one run as uploaded, plus the playback proxy the server makes from it.

/** What the server learned about an uploaded video (ffprobe stream fields and the packet list). */
export interface VideoProbe {
  durationSec: number;
  /** Stored (coded) frame size. */
  width: number;
  height: number;
  /** Frame size as shown, after the rotation is applied (width and height swap at 90 and 270). */
  displayWidth: number;
  displayHeight: number;
  /** Clockwise degrees to turn a stored frame to show it upright (phones record portrait this way). */
  rotation: 0 | 90 | 180 | 270;
  /** ffprobe codec name, e.g. "h264", "hevc", "vp9". */
  codec: string;
  /** ffprobe pixel format, e.g. "yuv420p". */
  pixelFormat: string;
  /** The stream's base frame rate (r_frame_rate), e.g. 29.97 for "30000/1001". */
  nominalFps: number;
  /** Frames per second averaged over the whole stream. */
  averageFps: number;
  /** True when frame intervals are not constant (see frameIntervalStats). */
  variableFrameRate: boolean;
  frameCount: number;
  keyframeCount: number;
  /** Longest stretch between keyframes in seconds (how far back a seek may have to decode from). */
  maxKeyframeInterval: number;
  /** ISO 8601 creation time written by the camera, if any. */
  creationTime: string | null;
  /** ffprobe container name, e.g. "mov,mp4,m4a,3gp,3g2,mj2" or "matroska,webm". */
  container: string;
}

export type RecordingStatus = 'uploaded' | 'probing' | 'transcoding' | 'ready' | 'failed';

export interface RecordingProxy {
  width: number;
  height: number;
  sizeBytes: number;
}

export interface Recording {
  id: string;
  runId: string;
  /** File name as the uploader's device named it (shown, never used as a storage key). */
  originalName: string;
  sizeBytes: number;
  /** Hex SHA-256 of the uploaded bytes, computed while streaming. */
  sha256: string;
  /** Media type found from the file's bytes. */
  mimeType: string;
  status: RecordingStatus;
  /** Progress of the current step, 0–100. */
  progress: number;
  /** Why probing or transcoding failed, in words for people; null unless status is 'failed'. */
  failureReason: string | null;
  probe: VideoProbe | null;
  proxy: RecordingProxy | null;
  createdAt: string;
  /** User id of the uploader. */
  uploadedBy: string;
}

/** Presentation times of every frame of the video a reader steps through (the proxy once ready). */
export interface RecordingFrames {
  recordingId: string;
  /** Sorted frame presentation times in seconds. */
  times: number[];
  keyframeTimes: number[];
}

/** What a signed media link opens. */
export type MediaKind = 'proxy' | 'original' | 'poster';

export const MEDIA_KINDS: readonly MediaKind[] = ['proxy', 'original', 'poster'];

/** Short-lived links a `<video>` or `<img>` can load without an Authorization header. */
export interface MediaUrls {
  /** Null until the playback proxy is made. */
  proxyUrl: string | null;
  originalUrl: string;
  /** Null until the poster image is made. */
  posterUrl: string | null;
  /** ISO 8601 time after which the links stop working (on the server's clock). */
  expiresAt: string;
  /**
   * ISO 8601 time the server signed the links. Their lifetime is expiresAt − issuedAt whatever
   * the client's clock says, so a browser whose clock is off still renews them in time.
   */
  issuedAt: string;
}

/** Body of the 409 answer to an upload whose bytes are already a recording in the same campaign. */
export interface DuplicateRecordingError {
  statusCode: 409;
  error: string;
  message: string;
  duplicateOf: { runId: string; runName: string; recordingId: string };
}

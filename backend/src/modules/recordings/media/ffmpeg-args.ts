// Argument lists for ffmpeg and ffprobe. Pure: no process is started here. Every list is an array
// passed to execFile/spawn, never a shell string, and every path must be absolute, so a file name
// can be read neither as an option ("-…") nor as a protocol ("http:…", "concat:…").
import path from 'node:path';

/** Default short side of a playback proxy: digits on a panel stay legible at 720 lines. */
export const PROXY_SHORT_SIDE = 720;
/** Short side kept with `keepFullHd`, for footage where the displays are small in the frame. */
export const PROXY_FULL_HD_SHORT_SIDE = 1080;
export const POSTER_SHORT_SIDE = 360;
/** Keyframe interval (frames) when the source frame rate is unknown: one a second at 30 fps. */
export const DEFAULT_KEYFRAME_INTERVAL = 30;

export interface OutputOptions {
  /**
   * Server-chosen scratch directory. The output must lie inside it: ffmpeg is told to overwrite
   * (-y), which is only safe on a path the server made up itself.
   */
  workDir: string;
}

export interface ProxyOptions extends OutputOptions {
  /** Keep the source size up to a 1080 short side instead of reducing to 720. */
  keepFullHd?: boolean;
}

/** The probe fields the proxy settings depend on. */
export interface ProxySource {
  averageFps: number;
}

function assertAbsoluteFile(p: string, name: string): void {
  if (typeof p !== 'string' || p.length === 0 || !path.isAbsolute(p) || p.includes('\0')) {
    throw new Error(`${name} must be an absolute file path`);
  }
}

function assertInsideWorkDir(output: string, workDir: string): void {
  assertAbsoluteFile(output, 'output');
  assertAbsoluteFile(workDir, 'workDir');
  const rel = path.relative(path.resolve(workDir), path.resolve(output));
  if (rel === '' || rel.startsWith('..') || path.isAbsolute(rel)) {
    throw new Error('output must be a file inside the server-chosen work directory');
  }
}

/** Seconds as ffmpeg reads them: plain decimal, microsecond precision, no exponent. */
function formatSeconds(t: number): string {
  return String(Math.round(t * 1e6) / 1e6);
}

/**
 * Keyframe interval in frames: one keyframe per second at the source's average rate, so a seek
 * never decodes more than a second of video.
 */
export function keyframeInterval(averageFps: number | null | undefined): number {
  if (typeof averageFps !== 'number' || !Number.isFinite(averageFps) || averageFps <= 0) {
    return DEFAULT_KEYFRAME_INTERVAL;
  }
  return Math.max(1, Math.round(averageFps));
}

/**
 * scale filter that brings the short side down to `shortSide` (never up) and keeps both sides
 * even, as yuv420p needs. The expressions read the frame as it reaches the filter: ffmpeg has
 * already applied the rotation by then, so portrait footage is measured upright. The long side is
 * -2: scaled in proportion and rounded to an even number.
 */
export function shortSideScaleFilter(shortSide: number): string {
  if (!Number.isInteger(shortSide) || shortSide < 2) throw new Error('shortSide must be a whole number ≥ 2');
  const fit = (side: 'iw' | 'ih'): string => `trunc(min(${shortSide},${side})/2)*2`;
  return `scale=w='if(lte(iw,ih),${fit('iw')},-2)':h='if(lte(iw,ih),-2,${fit('ih')})'`;
}

/** ffmpeg's -2: the other side in proportion, rounded half up to an even number (av_rescale). */
function evenProportional(side: number, num: number, den: number): number {
  return Math.floor((side * num + den) / (2 * den)) * 2;
}

/** The frame size `shortSideScaleFilter` produces from a displayed (upright) frame size. */
export function scaledSize(displayWidth: number, displayHeight: number, shortSide: number): { width: number; height: number } {
  if (![displayWidth, displayHeight].every((n) => Number.isInteger(n) && n > 0)) {
    throw new Error('frame size must be positive whole numbers');
  }
  if (displayWidth <= displayHeight) {
    const width = Math.floor(Math.min(shortSide, displayWidth) / 2) * 2;
    return { width, height: evenProportional(width, displayHeight, displayWidth) };
  }
  const height = Math.floor(Math.min(shortSide, displayHeight) / 2) * 2;
  return { width: evenProportional(height, displayWidth, displayHeight), height };
}

export function proxyShortSide(options: Pick<ProxyOptions, 'keepFullHd'>): number {
  return options.keepFullHd ? PROXY_FULL_HD_SHORT_SIDE : PROXY_SHORT_SIDE;
}

/**
 * Playback proxy: H.264 with a keyframe every second (G = round(average fps) frames, and at every
 * whole second of time), fast-start, no audio. Every source frame is kept with its own timestamp
 * (-fps_mode passthrough with the source time base): the mp4 default would duplicate or drop frames
 * onto a constant-rate grid, and the default encoder time base would round variable-rate
 * timestamps. ffmpeg starts the proxy's timeline at the source's first frame, so the proxy's frame
 * times are the upload's minus its start time (equal for the usual file starting at 0); list them
 * from the proxy, which is what readers step through. Metadata (camera, location) is not copied
 * into the file we serve.
 */
export function proxyArgs(input: string, output: string, probe: ProxySource | null, options: ProxyOptions): string[] {
  assertAbsoluteFile(input, 'input');
  assertInsideWorkDir(output, options.workDir);
  const gop = String(keyframeInterval(probe?.averageFps));
  return [
    '-hide_banner',
    '-nostdin',
    '-loglevel', 'error',
    '-i', input,
    '-map', '0:V:0',
    '-vf', shortSideScaleFilter(proxyShortSide(options)),
    '-fps_mode', 'passthrough',
    '-enc_time_base', '-1',
    '-c:v', 'libx264',
    '-preset', 'veryfast',
    '-crf', '21',
    '-pix_fmt', 'yuv420p',
    '-g', gop,
    '-keyint_min', gop,
    '-sc_threshold', '0',
    // -g counts frames; on variable-rate footage a 15 fps stretch would double the GOP to 2 s.
    // A keyframe forced at every whole second keeps seeks short there too (on constant-rate
    // footage the forced and the counted keyframes coincide).
    '-force_key_frames', 'expr:gte(t,n_forced)',
    '-an', '-sn', '-dn',
    '-map_metadata', '-1',
    '-map_chapters', '-1',
    '-movflags', '+faststart',
    '-progress', 'pipe:1',
    '-nostats',
    '-f', 'mp4',
    '-y', output,
  ];
}

/** One JPEG frame at `atSec` (accurate seek), short side 360, for lists and cards. */
export function posterArgs(input: string, output: string, atSec: number, options: OutputOptions): string[] {
  assertAbsoluteFile(input, 'input');
  assertInsideWorkDir(output, options.workDir);
  if (typeof atSec !== 'number' || !Number.isFinite(atSec) || atSec < 0) {
    throw new Error('poster time must be a finite number of seconds ≥ 0');
  }
  return [
    '-hide_banner',
    '-nostdin',
    '-loglevel', 'error',
    '-ss', formatSeconds(atSec),
    '-i', input,
    '-map', '0:V:0',
    '-frames:v', '1',
    '-vf', shortSideScaleFilter(POSTER_SHORT_SIDE),
    '-c:v', 'mjpeg',
    '-q:v', '3',
    '-an', '-sn', '-dn',
    '-map_metadata', '-1',
    '-f', 'image2',
    '-update', '1',
    '-y', output,
  ];
}

/**
 * ffprobe JSON with the stream, side-data (display matrix rotation), tag and container fields
 * parseProbe reads. All streams are listed so "no video stream" can say what the file holds.
 */
export function probeArgs(input: string): string[] {
  assertAbsoluteFile(input, 'input');
  const entries = [
    'stream=index,codec_type,codec_name,width,height,pix_fmt,r_frame_rate,avg_frame_rate,time_base,nb_frames,duration,start_time',
    'stream_tags=rotate,creation_time',
    'stream_side_data=rotation',
    'stream_disposition=attached_pic',
    'format=format_name,duration,start_time,size',
    'format_tags=creation_time',
  ].join(':');
  return ['-v', 'error', '-print_format', 'json', '-show_entries', entries, input];
}

/**
 * Every packet's presentation time and flags of the first real video stream (V skips cover
 * pictures), as CSV lines "pts_time,flags". Reads the container only; nothing is decoded, so a
 * ten-minute file lists in about half a second.
 */
export function packetTimesArgs(input: string): string[] {
  assertAbsoluteFile(input, 'input');
  return ['-v', 'error', '-select_streams', 'V:0', '-show_entries', 'packet=pts_time,flags', '-of', 'csv=p=0', input];
}

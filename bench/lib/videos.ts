// Videos the benchmarks feed the app, made on the spot with ffmpeg (synthetic test patterns, no
// footage of anyone).
import path from 'node:path';
import { runTool } from './harness';

const FFMPEG = process.env.FFMPEG_PATH || 'ffmpeg';

export interface TestVideo {
  seconds: number;
  width: number;
  height: number;
  fps: number;
  /** Frames between keyframes; a camera writes one every few seconds. */
  gop: number;
}

/** An H.264 MP4 of a moving test pattern, written to `dir/name`; returns its path. */
export async function makeTestVideo(dir: string, name: string, video: TestVideo): Promise<string> {
  const file = path.join(dir, name);
  await runTool(
    FFMPEG,
    [
      '-nostdin',
      '-y',
      '-v',
      'error',
      '-f',
      'lavfi',
      '-i',
      `testsrc2=size=${video.width}x${video.height}:rate=${video.fps}`,
      '-t',
      String(video.seconds),
      '-c:v',
      'libx264',
      '-preset',
      'veryfast',
      '-g',
      String(video.gop),
      '-pix_fmt',
      'yuv420p',
      '-an',
      file,
    ],
    dir,
  );
  return file;
}

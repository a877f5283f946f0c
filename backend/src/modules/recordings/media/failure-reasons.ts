// Turns whatever stopped the processing of a recording into words for the people who uploaded it,
// and says whether trying again could help. Raw tool output never reaches a client.
import { StorageNotFoundError } from '../../../storage/storage-driver';
import { MediaProbeError } from './ffprobe-parse';
import { ToolError } from './ffmpeg-runner';

export interface ProcessingFailure {
  /** One or two sentences for people; shown as the recording's failure reason. */
  reason: string;
  /** True when the file itself is the problem, so another attempt would fail the same way. */
  permanent: boolean;
}

export const DAMAGED = 'The video could not be read: the file is damaged or incomplete.';
export const NO_VIDEO = 'No video stream was found in this file.';
export const MISSING_ORIGINAL = 'The uploaded file is missing from storage. Upload it again.';
export const UNEXPECTED =
  'The video could not be processed because of a problem on the server. Try uploading it again; if it keeps failing, tell your administrator.';

const DAMAGE_PATTERNS = [
  /moov atom not found/i,
  /invalid data found when processing input/i,
  /end of file/i,
  /truncat/i,
  /corrupt/i,
  /error while decoding/i,
  /invalid nal unit/i,
  /could not find codec parameters/i,
  /error reading header/i,
  /no frame/i,
  /EBML header parsing failed/i,
  /partial file/i,
];

/** ffmpeg's words for "I cannot decode this codec". */
const UNSUPPORTED_PATTERNS = [
  /decoder \(codec ([\w-]+)\) not found/i,
  /unsupported codec(?: with id \d+)?(?: for input stream \d+)?/i,
  /codec ([\w-]+) is not supported/i,
  /is not supported in this build/i,
];

function unsupportedCodec(stderr: string): string | null {
  for (const pattern of UNSUPPORTED_PATTERNS) {
    const m = pattern.exec(stderr);
    if (m) return m[1] ? `This video's codec (${m[1]}) cannot be decoded on the server.` : 'This video uses a codec the server cannot decode.';
  }
  return null;
}

function fromProbeError(error: MediaProbeError): ProcessingFailure {
  const m = /^no video stream: the file holds only (.+)$/.exec(error.message);
  if (m) return { reason: `${NO_VIDEO} It holds only ${m[1]}.`, permanent: true };
  if (error.message.startsWith('no video stream')) return { reason: NO_VIDEO, permanent: true };
  if (error.message === 'the video stream has no frames') {
    return { reason: 'The video could not be read: it contains no frames.', permanent: true };
  }
  return { reason: DAMAGED, permanent: true };
}

function fromToolError(error: ToolError): ProcessingFailure {
  if (error.failure === 'spawn') {
    return { reason: `The server cannot run ${error.tool}. Tell your administrator.`, permanent: false };
  }
  if (error.failure === 'output-too-large') return { reason: DAMAGED, permanent: true };
  const stderr = error.stderrTail;
  if (/no space left on device/i.test(stderr)) {
    return { reason: 'The server ran out of disk space while processing the video. Tell your administrator.', permanent: false };
  }
  const codec = unsupportedCodec(stderr);
  if (codec) return { reason: codec, permanent: true };
  if (DAMAGE_PATTERNS.some((p) => p.test(stderr))) return { reason: DAMAGED, permanent: true };
  // ffprobe failing on a file it was given is the file's fault in practice; ffmpeg dying
  // without a known message may be memory or a signal, which another attempt can survive.
  if (error.tool === 'ffprobe' && error.failure === 'exit') return { reason: DAMAGED, permanent: true };
  return { reason: UNEXPECTED, permanent: false };
}

export function describeProcessingFailure(error: unknown): ProcessingFailure {
  if (error instanceof MediaProbeError) return fromProbeError(error);
  if (error instanceof ToolError) return fromToolError(error);
  if (error instanceof StorageNotFoundError) return { reason: MISSING_ORIGINAL, permanent: true };
  if ((error as NodeJS.ErrnoException | null)?.code === 'ENOSPC') {
    return { reason: 'The server ran out of disk space while processing the video. Tell your administrator.', permanent: false };
  }
  return { reason: UNEXPECTED, permanent: false };
}

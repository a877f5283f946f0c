import { UnsupportedMediaTypeException } from '@nestjs/common';
import { fileTypeFromBuffer } from 'file-type';

/** Bytes from the start of an upload that the type is decided on; containers say what they are up front. */
export const TYPE_SNIFF_BYTES = 64 * 1024;

export interface DetectedType {
  /** Media type found in the bytes, e.g. video/mp4; 'text/plain' for text; null when nothing matched. */
  mime: string | null;
  isVideo: boolean;
}

/** True for bytes that decode as UTF-8 text without control characters other than white space. */
export function looksLikeText(head: Uint8Array): boolean {
  if (head.length === 0) return false;
  let text: string;
  try {
    // A multi-byte character may be cut at the end of the sample; drop up to three bytes of it.
    text = new TextDecoder('utf-8', { fatal: true }).decode(trimPartialUtf8(head));
  } catch {
    return false;
  }
  // eslint-disable-next-line no-control-regex
  return !/[\u0000-\u0008\u000B\u000E-\u001F\u007F]/.test(text);
}

function trimPartialUtf8(bytes: Uint8Array): Uint8Array {
  let end = bytes.length;
  for (let i = 1; i <= 3 && end - i >= 0; i++) {
    const b = bytes[end - i];
    if ((b & 0xc0) === 0x80) continue; // continuation byte: keep looking for the lead byte
    const need = b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : b >= 0xc0 ? 2 : 1;
    if (need > i) end -= i;
    break;
  }
  return bytes.subarray(0, end);
}

/**
 * Decides from the first bytes (never from the name or the client's Content-Type) whether an
 * upload is a video container: MP4, QuickTime, M4V, 3GP, WebM, Matroska, AVI, MPEG-PS/TS, FLV,
 * Ogg video, ASF/WMV, MXF.
 */
export async function detectVideoType(head: Uint8Array): Promise<DetectedType> {
  const found = await fileTypeFromBuffer(head);
  if (found) return { mime: found.mime, isVideo: isVideoMime(found.mime) };
  return { mime: looksLikeText(head) ? 'text/plain' : null, isVideo: false };
}

export function isVideoMime(mime: string): boolean {
  return mime.startsWith('video/') || mime === 'application/mxf';
}

export function notAVideo(type: DetectedType): UnsupportedMediaTypeException {
  return new UnsupportedMediaTypeException(`This file is not a video (found: ${type.mime ?? 'unknown type'})`);
}

/** Throws 415 unless the bytes are a video container; returns the media type found. */
export async function requireVideo(head: Uint8Array): Promise<string> {
  const type = await detectVideoType(head);
  if (!type.isVideo || !type.mime) throw notAVideo(type);
  return type.mime;
}

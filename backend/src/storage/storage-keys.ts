import { isUUID } from 'class-validator';

/** The files a recording owns; every key is derived from the server-chosen recording id. */
export type RecordingObject = 'original' | 'proxy' | 'poster';

const FILE_NAMES: Record<RecordingObject, string> = {
  original: 'original',
  proxy: 'proxy.mp4',
  poster: 'poster.jpg',
};

/**
 * Keys are short relative paths of lower-case letters, digits, dots, hyphens and underscores in
 * slash-separated segments, none of them "." or "..": they map one-to-one onto a file under the
 * local root and onto an S3 key, and cannot climb out of either.
 */
const KEY_PATTERN = /^[a-z0-9_-][a-z0-9._-]*(\/[a-z0-9_-][a-z0-9._-]*)*$/;

export class InvalidStorageKeyError extends Error {
  override name = 'InvalidStorageKeyError';
}

export function assertStorageKey(key: string): void {
  if (typeof key !== 'string' || key.length === 0 || key.length > 512 || !KEY_PATTERN.test(key)) {
    throw new InvalidStorageKeyError(`not a storage key: ${JSON.stringify(String(key).slice(0, 80))}`);
  }
  if (key.split('/').some((segment) => segment === '.' || segment === '..' || /^\.+$/.test(segment))) {
    throw new InvalidStorageKeyError(`not a storage key: ${JSON.stringify(key.slice(0, 80))}`);
  }
}

/** recordings/<recordingId>/original, …/proxy.mp4, …/poster.jpg */
export function recordingKey(recordingId: string, object: RecordingObject): string {
  if (!isUUID(recordingId)) throw new InvalidStorageKeyError('a recording key needs the recording id (a UUID)');
  const key = `recordings/${recordingId.toLowerCase()}/${FILE_NAMES[object]}`;
  assertStorageKey(key);
  return key;
}

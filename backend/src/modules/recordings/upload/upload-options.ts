import type { MulterModuleOptions } from '@nestjs/platform-express';
import { HashingDiskStorage } from './hashing-disk-storage';
import { requireVideo, TYPE_SNIFF_BYTES } from './video-type';

/** The multer engine for recordings: STORAGE_DIR/tmp, SHA-256 while streaming, type from the first bytes. */
export function uploadEngine(tmpDir: string): HashingDiskStorage {
  return new HashingDiskStorage({ directory: tmpDir, headBytes: TYPE_SNIFF_BYTES, inspectHead: requireVideo });
}

/** One file of at most `maxBytes`, and hardly anything else: the form carries nothing but the file. */
export function uploadOptions(tmpDir: string, maxBytes: number): MulterModuleOptions {
  return {
    storage: uploadEngine(tmpDir),
    limits: { fileSize: maxBytes, files: 1, fields: 5, fieldSize: 4096, parts: 6, headerPairs: 50 },
  };
}

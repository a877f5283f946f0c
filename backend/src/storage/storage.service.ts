import { Injectable, Logger, OnApplicationShutdown, OnModuleInit } from '@nestjs/common';
import { randomBytes } from 'node:crypto';
import { mkdir, mkdtemp, readdir, rm, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { AppConfig } from '../config/app-config';
import { LocalStorageDriver } from './local-storage.driver';
import { S3StorageDriver } from './s3-storage.driver';
import type { ByteRange, PutOptions, StorageDriver, StorageStat } from './storage-driver';
import { assertStorageKey } from './storage-keys';

/** Leftovers of a crashed process older than this are removed from STORAGE_DIR/tmp at start. */
const STALE_TEMP_MS = 24 * 60 * 60 * 1000;

export function buildStorageDriver(config: AppConfig): StorageDriver {
  const tmpDir = join(config.storageDir, 'tmp');
  if (config.storageDriver === 's3') {
    if (!config.s3) throw new Error('STORAGE_DRIVER=s3 needs the S3 settings');
    return new S3StorageDriver(config.s3, tmpDir);
  }
  return new LocalStorageDriver(join(config.storageDir, 'objects'));
}

/**
 * The one way to keep and fetch recording files, whichever driver holds them. Every key is
 * checked here (server-made keys only, see storage-keys.ts); temporary files live under
 * STORAGE_DIR/tmp on local disk in both cases, so uploads and tools always have a real path.
 */
@Injectable()
export class StorageService implements OnModuleInit, OnApplicationShutdown {
  private readonly logger = new Logger('Storage');
  readonly tmpDir: string;

  constructor(
    config: AppConfig,
    private readonly driver: StorageDriver = buildStorageDriver(config),
  ) {
    this.tmpDir = join(config.storageDir, 'tmp');
  }

  get driverName(): 'local' | 's3' {
    return this.driver.name;
  }

  async onModuleInit(): Promise<void> {
    await mkdir(this.tmpDir, { recursive: true, mode: 0o700 });
    await this.removeStaleTemp();
    try {
      await this.driver.check();
    } catch (error) {
      // Start anyway: the health of the store can change, and each request reports its own error.
      this.logger.error(`storage check failed: ${error instanceof Error ? error.message : String(error)}`);
    }
  }

  onApplicationShutdown(): void {
    if (this.driver instanceof S3StorageDriver) this.driver.destroy();
  }

  async put(key: string, fromLocalPath: string, options?: PutOptions): Promise<void> {
    assertStorageKey(key);
    return this.driver.put(key, fromLocalPath, options);
  }

  async openRead(key: string, range?: ByteRange): Promise<Readable> {
    assertStorageKey(key);
    if (range && !(Number.isInteger(range.start) && Number.isInteger(range.end) && range.start >= 0 && range.end >= range.start)) {
      throw new RangeError(`bad byte range ${range.start}-${range.end}`);
    }
    return this.driver.openRead(key, range);
  }

  async stat(key: string): Promise<StorageStat | null> {
    assertStorageKey(key);
    return this.driver.stat(key);
  }

  async delete(key: string): Promise<void> {
    assertStorageKey(key);
    return this.driver.delete(key);
  }

  /** Deletes every key given, logging (not throwing) what could not be removed. */
  async deleteQuietly(keys: ReadonlyArray<string | null | undefined>): Promise<void> {
    for (const key of keys) {
      if (!key) continue;
      try {
        await this.delete(key);
      } catch (error) {
        this.logger.warn(`could not remove ${key}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
  }

  async withLocalFile<T>(key: string, fn: (path: string) => Promise<T>): Promise<T> {
    assertStorageKey(key);
    return this.driver.withLocalFile(key, fn);
  }

  /** A fresh path under STORAGE_DIR/tmp that nobody uses yet; the caller creates and removes it. */
  tempPath(prefix: string): string {
    if (!/^[a-z][a-z0-9-]*$/.test(prefix)) throw new Error(`bad temp prefix ${prefix}`);
    return join(this.tmpDir, `${prefix}-${randomBytes(16).toString('hex')}`);
  }

  /** A private scratch directory under STORAGE_DIR/tmp; the caller removes it. */
  async makeWorkDir(): Promise<string> {
    await mkdir(this.tmpDir, { recursive: true, mode: 0o700 });
    return mkdtemp(join(this.tmpDir, 'work-'));
  }

  private async removeStaleTemp(): Promise<void> {
    const now = Date.now();
    for (const name of await readdir(this.tmpDir)) {
      const path = join(this.tmpDir, name);
      try {
        const s = await stat(path);
        if (now - s.mtimeMs > STALE_TEMP_MS) await rm(path, { recursive: true, force: true });
      } catch {
        // Removed by its owner meanwhile.
      }
    }
  }
}

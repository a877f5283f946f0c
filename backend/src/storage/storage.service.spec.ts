// One contract, run against both drivers: the local disk and an S3 bucket (on a fake S3 server
// that this test starts on 127.0.0.1).
import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeS3, type FakeS3 } from '../../test/helpers/fake-s3';
import type { AppConfig } from '../config/app-config';
import { LocalStorageDriver } from './local-storage.driver';
import { S3StorageDriver } from './s3-storage.driver';
import { StorageNotFoundError } from './storage-driver';
import { InvalidStorageKeyError, recordingKey } from './storage-keys';
import { buildStorageDriver, StorageService } from './storage.service';

async function read(stream: Readable): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks);
}

interface DriverCase {
  name: string;
  make(storageDir: string): Promise<StorageService>;
}

let fake: FakeS3;
beforeAll(async () => {
  fake = await startFakeS3();
});
afterAll(() => fake.stop());

const config = (storageDir: string, extra: Partial<AppConfig> = {}) => ({ storageDir, storageDriver: 'local', s3: null, ...extra }) as AppConfig;

const cases: DriverCase[] = [
  {
    name: 'local',
    make: async (dir) => new StorageService(config(dir), new LocalStorageDriver(join(dir, 'objects'))),
  },
  {
    name: 's3',
    make: async (dir) => new StorageService(config(dir), new S3StorageDriver(fake.settings, join(dir, 'tmp'))),
  },
];

describe.each(cases)('StorageService with the $name driver', ({ name, make }) => {
  let dir: string;
  let storage: StorageService;
  const payload = randomBytes(3 * 1024 * 1024 + 123);

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), `dialsheet-storage-${name}-`));
    storage = await make(dir);
    await storage.onModuleInit();
  });
  afterAll(() => {
    storage.onApplicationShutdown();
    rmSync(dir, { recursive: true, force: true });
  });

  function source(bytes: Buffer = payload): string {
    const path = storage.tempPath('test');
    writeFileSync(path, bytes);
    return path;
  }

  it('put consumes the source file and stat reports the size', async () => {
    const key = recordingKey(randomUUID(), 'original');
    const from = source();
    await storage.put(key, from, { contentType: 'video/mp4' });
    expect(existsSync(from)).toBe(false);
    const stat = await storage.stat(key);
    expect(stat?.size).toBe(payload.length);
    expect(stat?.lastModified).toBeInstanceOf(Date);
  });

  it('reads the whole object and any inclusive byte range of it', async () => {
    const key = recordingKey(randomUUID(), 'proxy');
    await storage.put(key, source());
    expect(createHash('sha256').update(await read(await storage.openRead(key))).digest('hex')).toBe(
      createHash('sha256').update(payload).digest('hex'),
    );
    for (const [start, end] of [
      [0, 0],
      [0, 99],
      [1_000_000, 1_000_999],
      [payload.length - 10, payload.length - 1],
    ]) {
      const part = await read(await storage.openRead(key, { start, end }));
      expect(part.equals(payload.subarray(start, end + 1)), `${start}-${end}`).toBe(true);
    }
  });

  it('says what is missing: stat → null, openRead and withLocalFile → StorageNotFoundError', async () => {
    const key = recordingKey(randomUUID(), 'poster');
    expect(await storage.stat(key)).toBeNull();
    await expect(storage.openRead(key)).rejects.toBeInstanceOf(StorageNotFoundError);
    await expect(storage.withLocalFile(key, async () => 'never')).rejects.toBeInstanceOf(StorageNotFoundError);
  });

  it('delete removes the object and is harmless when repeated', async () => {
    const key = recordingKey(randomUUID(), 'poster');
    await storage.put(key, source(Buffer.from('jpeg bytes')));
    await storage.delete(key);
    expect(await storage.stat(key)).toBeNull();
    await storage.delete(key);
  });

  it('withLocalFile hands a readable path with the bytes and cleans up after itself', async () => {
    const key = recordingKey(randomUUID(), 'original');
    await storage.put(key, source());
    let seen = '';
    const result = await storage.withLocalFile(key, async (path) => {
      seen = path;
      expect((await readFile(path)).equals(payload)).toBe(true);
      return 42;
    });
    expect(result).toBe(42);
    if (name === 's3') expect(existsSync(seen)).toBe(false);
    else expect(existsSync(seen)).toBe(true);
    expect(readdirSync(storage.tmpDir)).toEqual([]);
  });

  it('refuses keys that were not made by the server before any driver sees them', async () => {
    for (const key of ['../outside', '/etc/passwd', 'recordings/../../x', 'Recordings/X']) {
      await expect(storage.stat(key)).rejects.toBeInstanceOf(InvalidStorageKeyError);
      await expect(storage.openRead(key)).rejects.toBeInstanceOf(InvalidStorageKeyError);
      await expect(storage.delete(key)).rejects.toBeInstanceOf(InvalidStorageKeyError);
      await expect(storage.withLocalFile(key, async () => 1)).rejects.toBeInstanceOf(InvalidStorageKeyError);
      const from = source();
      await expect(storage.put(key, from)).rejects.toBeInstanceOf(InvalidStorageKeyError);
      // Nothing was consumed or stored.
      expect(existsSync(from)).toBe(true);
    }
  });
});

describe('local driver specifics', () => {
  it('keeps objects under STORAGE_DIR/objects/<key> and tidies empty folders on delete', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'dialsheet-storage-layout-'));
    try {
      const storage = new StorageService(config(dir), buildStorageDriver(config(dir)));
      await storage.onModuleInit();
      const id = randomUUID();
      const path = storage.tempPath('test');
      writeFileSync(path, 'x');
      await storage.put(recordingKey(id, 'original'), path);
      expect(readFileSync(join(dir, 'objects', 'recordings', id, 'original'), 'utf8')).toBe('x');
      await storage.delete(recordingKey(id, 'original'));
      expect(existsSync(join(dir, 'objects', 'recordings', id))).toBe(false);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('builds the S3 driver from configuration', () => {
    const driver = buildStorageDriver(config('/nowhere', { storageDriver: 's3', s3: fake.settings }));
    expect(driver.name).toBe('s3');
    (driver as S3StorageDriver).destroy();
  });
});

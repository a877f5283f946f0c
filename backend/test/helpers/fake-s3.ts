import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import S3rver from 's3rver';
import type { S3Settings } from '../../src/config/app-config';

/**
 * A local S3 look-alike for tests: s3rver 3.7, listening on 127.0.0.1 on a free port, with its
 * objects in a temporary directory. It speaks the S3 REST API with SigV4 but does not decode the
 * aws-chunked uploads that current SDKs send by default, which is why our S3 client asks for
 * checksums only when required (see s3-storage.driver.ts).
 */
export interface FakeS3 {
  settings: S3Settings;
  env: Record<string, string>;
  /** Where s3rver keeps objects: <dir>/<bucket>/<key>._S3rver_object */
  dir: string;
  stop(): Promise<void>;
}

export async function startFakeS3(bucket = 'dialsheet-test'): Promise<FakeS3> {
  const dir = mkdtempSync(join(tmpdir(), 'dialsheet-s3-'));
  const server = new S3rver({
    address: '127.0.0.1',
    port: 0,
    silent: true,
    directory: dir,
    configureBuckets: [{ name: bucket, configs: [] }],
  });
  const { port } = (await server.run()) as { port: number };
  const endpoint = `http://127.0.0.1:${port}`;
  // s3rver accepts exactly this key pair.
  const settings: S3Settings = {
    bucket,
    endpoint,
    region: 'us-east-1',
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    forcePathStyle: true,
  };
  return {
    settings,
    env: {
      STORAGE_DRIVER: 's3',
      S3_BUCKET: bucket,
      S3_ENDPOINT: endpoint,
      S3_REGION: 'us-east-1',
      S3_ACCESS_KEY_ID: 'S3RVER',
      S3_SECRET_ACCESS_KEY: 'S3RVER',
      S3_FORCE_PATH_STYLE: 'true',
    },
    dir,
    async stop() {
      await server.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

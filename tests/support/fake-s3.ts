/** A local S3-compatible server (s3rver) on 127.0.0.1, for running the S3 driver in tests. */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { s3Storage } from '../../server/storage/s3-storage';

export interface FakeS3 {
  endpoint: string;
  bucket: string;
  storage: ReturnType<typeof s3Storage>;
  close(): Promise<void>;
}

export async function startFakeS3(bucket = 'rowtally-test-photos'): Promise<FakeS3> {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-s3-'));
  const server = new S3rver({
    address: '127.0.0.1',
    port: 0,
    silent: true,
    directory,
    configureBuckets: [{ name: bucket }],
  });
  const { port } = await server.run();
  const endpoint = `http://127.0.0.1:${port}`;
  // s3rver accepts any key pair it is configured with; these are its documented defaults.
  const storage = s3Storage({
    endpoint,
    bucket,
    region: 'us-east-1',
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
  });
  return {
    endpoint,
    bucket,
    storage,
    async close() {
      storage.client.destroy();
      await server.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}

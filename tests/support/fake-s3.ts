/** A local S3-compatible server (s3rver) on 127.0.0.1, for running the S3 driver in tests. */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { FAKE_S3_KEYS, startFakeS3 as startS3rver } from '../../scripts/cluster/fake-s3';
import { s3Storage } from '../../server/storage/s3-storage';

export interface FakeS3 {
  endpoint: string;
  bucket: string;
  storage: ReturnType<typeof s3Storage>;
  close(): Promise<void>;
}

export async function startFakeS3(bucket = 'rowtally-test-photos'): Promise<FakeS3> {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-s3-'));
  const server = await startS3rver({ directory, bucket });
  const storage = s3Storage({
    endpoint: server.endpoint,
    bucket,
    region: 'us-east-1',
    ...FAKE_S3_KEYS,
  });
  return {
    endpoint: server.endpoint,
    bucket,
    storage,
    async close() {
      storage.client.destroy();
      await server.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}

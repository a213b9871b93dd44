/** A local S3-compatible server (s3rver) on 127.0.0.1: the bucket of the local cluster and the tests. */
import fs from 'node:fs';
import S3rver from 's3rver';

/** s3rver accepts any key pair it is configured with; these are its documented defaults. */
export const FAKE_S3_KEYS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;

export interface RunningFakeS3 {
  endpoint: string;
  bucket: string;
  close(): Promise<void>;
}

/** Serves the bucket's objects from `directory` (kept, so a restart finds them); port 0 picks one. */
export async function startFakeS3(opts: {
  directory: string;
  bucket: string;
  port?: number;
}): Promise<RunningFakeS3> {
  fs.mkdirSync(opts.directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port ?? 0,
    silent: true,
    directory: opts.directory,
    configureBuckets: [{ name: opts.bucket }],
  });
  const { port } = await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    bucket: opts.bucket,
    close: () => server.close(),
  };
}

import type { Env } from '../env';
import { localStorage } from './local-storage';
import type { ObjectStorage } from './object-storage';
import { s3Storage } from './s3-storage';

/** The storage driver the environment asks for (STORAGE_DRIVER, UPLOADS_DIR, S3_*). */
export function createStorage(env: Env): ObjectStorage {
  if (env.STORAGE_DRIVER === 'local') return localStorage(env.UPLOADS_DIR);
  if (!env.S3_BUCKET) throw new Error('S3_BUCKET must be set when STORAGE_DRIVER is s3.');
  return s3Storage({
    endpoint: env.S3_ENDPOINT,
    bucket: env.S3_BUCKET,
    region: env.S3_REGION,
    accessKeyId: env.S3_ACCESS_KEY_ID,
    secretAccessKey: env.S3_SECRET_ACCESS_KEY,
  });
}

import type { Readable } from 'node:stream';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  ListObjectsV2Command,
  NoSuchKey,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { assertKey, type ObjectStorage } from './object-storage';

export interface S3Options {
  endpoint?: string;
  bucket: string;
  region: string;
  accessKeyId?: string;
  secretAccessKey?: string;
}

/** S3-compatible object storage, for when several app servers share one set of files. */
export function s3Storage(opts: S3Options): ObjectStorage & { client: S3Client } {
  const client = new S3Client({
    region: opts.region,
    ...(opts.endpoint ? { endpoint: opts.endpoint, forcePathStyle: true } : {}),
    ...(opts.accessKeyId && opts.secretAccessKey
      ? { credentials: { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey } }
      : {}),
  });
  const Bucket = opts.bucket;
  return {
    driver: 's3',
    client,
    async put(key, body, contentType) {
      assertKey(key);
      // A single PUT is all-or-nothing: a failed one leaves no object behind.
      await client.send(
        new PutObjectCommand({ Bucket, Key: key, Body: body, ContentType: contentType }),
      );
    },
    async get(key) {
      assertKey(key);
      try {
        const res = await client.send(new GetObjectCommand({ Bucket, Key: key }));
        return {
          body: res.Body as Readable,
          size: res.ContentLength ?? 0,
          contentType: res.ContentType ?? 'application/octet-stream',
        };
      } catch (err) {
        if (err instanceof NoSuchKey || (err as { name?: string }).name === 'NoSuchKey')
          return null;
        throw err;
      }
    },
    async delete(key) {
      assertKey(key);
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
    async list(prefix) {
      const keys: string[] = [];
      let token: string | undefined;
      do {
        const res = await client.send(
          new ListObjectsV2Command({ Bucket, Prefix: prefix, ContinuationToken: token }),
        );
        for (const o of res.Contents ?? []) if (o.Key) keys.push(o.Key);
        token = res.IsTruncated ? res.NextContinuationToken : undefined;
      } while (token);
      return keys.sort();
    },
    async check() {
      await client.send(new HeadBucketCommand({ Bucket }));
    },
  };
}

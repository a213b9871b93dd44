/** One suite, both storage drivers: the local folder and S3 (against a local s3rver). */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { text } from 'node:stream/consumers';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localStorage } from '../../server/storage/local-storage';
import type { ObjectStorage } from '../../server/storage/object-storage';
import { type FakeS3, startFakeS3 } from '../support/fake-s3';

let s3: FakeS3;
let localRoot: string;
const drivers: Record<'local' | 's3', () => ObjectStorage> = {
  local: () => localStorage(localRoot),
  s3: () => s3.storage,
};

beforeAll(async () => {
  localRoot = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-storage-'));
  s3 = await startFakeS3();
});
afterAll(async () => {
  await s3?.close();
  fs.rmSync(localRoot, { recursive: true, force: true });
});

describe.each(['local', 's3'] as const)('%s storage driver', (name) => {
  const storage = () => drivers[name]();
  const prefix = `photos/00000000-0000-4000-8000-00000000000${name === 'local' ? 1 : 2}`;

  it('names itself', () => {
    expect(storage().driver).toBe(name);
  });

  it('returns exactly the bytes and type that were written', async () => {
    const body = Buffer.from([0x52, 0x49, 0x46, 0x46, 0, 1, 2, 3, 255, 254]);
    await storage().put(`${prefix}/a1/thumb.webp`, body, 'image/webp');
    const got = await storage().get(`${prefix}/a1/thumb.webp`);
    expect(got).not.toBeNull();
    expect(got!.size).toBe(body.length);
    expect(got!.contentType).toBe('image/webp');
    const chunks: Buffer[] = [];
    for await (const c of got!.body) chunks.push(Buffer.from(c));
    expect(Buffer.concat(chunks).equals(body)).toBe(true);
  });

  it('replaces an object written twice under one key', async () => {
    await storage().put(`${prefix}/a2/display.webp`, Buffer.from('first'), 'image/webp');
    await storage().put(`${prefix}/a2/display.webp`, Buffer.from('second'), 'image/webp');
    const got = await storage().get(`${prefix}/a2/display.webp`);
    expect(await text(got!.body)).toBe('second');
  });

  it('answers null for a key that was never written', async () => {
    expect(await storage().get(`${prefix}/nothing/thumb.webp`)).toBeNull();
  });

  it('deletes, and deleting again is not an error', async () => {
    await storage().put(`${prefix}/a3/original.jpg`, Buffer.from('x'), 'image/jpeg');
    await storage().delete(`${prefix}/a3/original.jpg`);
    expect(await storage().get(`${prefix}/a3/original.jpg`)).toBeNull();
    await expect(storage().delete(`${prefix}/a3/original.jpg`)).resolves.toBeUndefined();
  });

  it('lists the keys under a prefix, and only those', async () => {
    await storage().put(`${prefix}/b1/thumb.webp`, Buffer.from('t'), 'image/webp');
    await storage().put(`${prefix}/b1/display.webp`, Buffer.from('d'), 'image/webp');
    await storage().put(`${prefix}/b2/thumb.webp`, Buffer.from('t'), 'image/webp');
    expect(await storage().list(`${prefix}/b1/`)).toEqual([
      `${prefix}/b1/display.webp`,
      `${prefix}/b1/thumb.webp`,
    ]);
    expect(await storage().list(`${prefix}/zz/`)).toEqual([]);
  });

  it('refuses keys that could escape the folder or bucket', async () => {
    for (const key of ['../etc/passwd', 'photos/../x', '/abs', 'photos//x', 'Photos/X', '']) {
      await expect(storage().put(key, Buffer.from('x'), 'image/webp')).rejects.toThrow(
        /Not a valid storage key/,
      );
    }
  });
});

describe('local driver on disk', () => {
  it('leaves no partial file or empty folder behind after a delete', async () => {
    const storage = localStorage(localRoot);
    await storage.put('photos/tidy/c1/thumb.webp', Buffer.from('x'), 'image/webp');
    await storage.delete('photos/tidy/c1/thumb.webp');
    expect(fs.existsSync(path.join(localRoot, 'photos', 'tidy'))).toBe(false);
  });
});

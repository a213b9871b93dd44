import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { localStorage } from '../../server/storage/local-storage';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

let d: TestDatabase;
const folder = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-demo-photos-'));
beforeAll(async () => {
  d = await createTestDatabase();
});
afterAll(async () => {
  await d.drop();
  fs.rmSync(folder, { recursive: true, force: true });
});

describe('the demo season', () => {
  it('loads once into an empty database, with a cover drawing per okra entry stored like an upload', async () => {
    const storage = localStorage(folder);
    expect(await seedDemoIfEmpty(d.db, storage)).toBe(true);
    expect(await seedDemoIfEmpty(d.db, storage)).toBe(false);
    const photos = await d.db
      .selectFrom('photos as p')
      .innerJoin('entries as e', 'e.id', 'p.entry_id')
      .select(['p.storage_key', 'p.is_cover', 'e.code', 'p.caption'])
      .execute();
    expect(photos.map((p) => p.code).sort()).toEqual(['CD', 'ML', 'RS', 'SR', 'TC', 'VL']);
    expect(photos.every((p) => p.is_cover && p.caption.includes('drawing'))).toBe(true);
    const display = await storage.get(`${photos[0]!.storage_key}/display.webp`);
    const chunks: Buffer[] = [];
    for await (const c of display!.body) chunks.push(c as Buffer);
    const meta = await sharp(Buffer.concat(chunks)).metadata();
    expect(meta.format).toBe('webp');
    expect(meta.exif).toBeUndefined();
    expect(Math.max(meta.width!, meta.height!)).toBeLessThanOrEqual(1600);
  });
});

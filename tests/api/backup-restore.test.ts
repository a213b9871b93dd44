/**
 * `npm run db:backup` / `db:restore`: a season with records and photos goes into one archive and
 * comes back into a fresh, empty database with every row and every photo byte unchanged.
 */
import { execFileSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { backup, backupFileName, restore } from '../../db/backup';
import { migrateToLatest } from '../../db/migrator';
import { seedDemoIfEmpty } from '../../db/seed/seed';
import { localStorage } from '../../server/storage/local-storage';
import { type FakeS3, startFakeS3 } from '../support/fake-s3';
import {
  createEmptyDatabase,
  createTestDatabase,
  type TestDatabase,
} from '../support/test-database';

const work = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-backup-test-'));
const sourcePhotos = path.join(work, 'source-uploads');
const restoredPhotos = path.join(work, 'restored-uploads');
const archives = path.join(work, 'archives');

let source: TestDatabase;
let target: TestDatabase;
let s3: FakeS3 | undefined;

beforeAll(async () => {
  source = await createTestDatabase();
  target = await createEmptyDatabase();
  // The demo season: trials, entries, plots, records, audit rows, a published sheet and photos.
  expect(await seedDemoIfEmpty(source.db, localStorage(sourcePhotos))).toBe(true);
}, 120_000);

afterAll(async () => {
  await source?.drop();
  await target?.drop();
  await s3?.close();
  fs.rmSync(work, { recursive: true, force: true });
});

/**
 * Every table's row count and PostgreSQL's md5() (RFC 1321) over its rows as text, in a fixed
 * order, plus every sequence's position: computed by the database itself, not by the code under test.
 */
async function fingerprint(url: string): Promise<Record<string, string>> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    const { rows: tables } = await client.query<{ name: string }>(
      `select table_name as name from information_schema.tables
        where table_schema = 'public' and table_type = 'BASE TABLE' order by 1`,
    );
    const out: Record<string, string> = {};
    for (const { name } of tables) {
      const ident = `public."${name.replace(/"/g, '""')}"`;
      const { rows } = await client.query<{ n: number; md5: string }>(
        `select count(*)::int as n,
                md5(coalesce(string_agg(t::text, E'\\n' order by t::text), '')) as md5
           from ${ident} t`,
      );
      out[name] = `${rows[0]!.n} rows, md5 ${rows[0]!.md5}`;
    }
    const { rows: seqs } = await client.query<{ name: string; last: string | null }>(
      `select sequencename as name, last_value::text as last from pg_sequences
        where schemaname = 'public' order by 1`,
    );
    for (const s of seqs) out[`sequence ${s.name}`] = String(s.last);
    return out;
  } finally {
    await client.end();
  }
}

/** Every file under a folder, by relative path, with its SHA-256 (FIPS 180-4, Node's crypto). */
function filesIn(root: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (dir: string, rel: string) => {
    if (!fs.existsSync(dir)) return;
    for (const d of fs.readdirSync(dir, { withFileTypes: true })) {
      const r = rel ? `${rel}/${d.name}` : d.name;
      if (d.isDirectory()) walk(path.join(dir, d.name), r);
      else
        out[r] = crypto
          .createHash('sha256')
          .update(fs.readFileSync(path.join(dir, d.name)))
          .digest('hex');
    }
  };
  walk(root, '');
  return out;
}

describe('backup and restore', () => {
  let archive: string;

  it('writes one dated archive holding a pg_dump custom-format file and every photo file', async () => {
    const now = new Date('2026-12-02T12:05:01.250Z');
    const result = await backup({
      databaseUrl: source.url,
      storage: localStorage(sourcePhotos),
      outDir: archives,
      now,
    });
    archive = result.file;
    expect(path.basename(archive)).toBe('rowtally-backup-20261202T120501Z.tar');
    expect(backupFileName(now)).toBe('rowtally-backup-20261202T120501Z.tar');
    expect(fs.readdirSync(archives)).toEqual([path.basename(archive)]);

    // GNU tar reads it; the dump starts with "PGDMP", the custom format's magic (PostgreSQL's
    // pg_backup_archiver.c, from memory).
    const listing = execFileSync('tar', ['-tf', archive], { encoding: 'utf8' });
    expect(listing).toContain('./database.pgdump');
    expect(listing).toContain('./manifest.json');
    const dump = execFileSync('tar', ['-xOf', archive, './database.pgdump']);
    expect(dump.subarray(0, 5).toString('latin1')).toBe('PGDMP');

    const photos = Object.keys(filesIn(sourcePhotos));
    expect(photos.length).toBeGreaterThan(0);
    expect(result.manifest.objects.map((o) => o.key).sort()).toEqual(photos.sort());
    for (const key of photos) expect(listing).toContain(`./photos/${key}`);
  });

  it('refuses to restore into a database that is not empty, and changes nothing', async () => {
    const before = await fingerprint(source.url);
    await expect(
      restore({ file: archive, databaseUrl: source.url, storage: localStorage(sourcePhotos) }),
    ).rejects.toThrow(/is not empty .*Restore only into an empty database.*Nothing was changed/s);
    expect(await fingerprint(source.url)).toEqual(before);
  });

  it('restores into a fresh empty database: every table, sequence and photo byte is the same', async () => {
    const result = await restore({
      file: archive,
      databaseUrl: target.url,
      storage: localStorage(restoredPhotos),
    });
    const expected = await fingerprint(source.url);
    expect(Object.keys(expected).length).toBeGreaterThan(10);
    expect(await fingerprint(target.url)).toEqual(expected);
    expect(filesIn(restoredPhotos)).toEqual(filesIn(sourcePhotos));
    expect(result.photosRestored).toBe(Object.keys(filesIn(sourcePhotos)).length);
    // The restored database carries its migration history: nothing left to apply.
    expect(await migrateToLatest(target.db)).toEqual([]);
  });

  it('refuses a file that is not a backup', async () => {
    const empty = await createEmptyDatabase();
    try {
      const bogus = path.join(work, 'not-a-backup.tar');
      fs.writeFileSync(path.join(work, 'hello.txt'), 'hello');
      execFileSync('tar', ['-cf', bogus, '-C', work, 'hello.txt']);
      await expect(
        restore({
          file: bogus,
          databaseUrl: empty.url,
          storage: localStorage(path.join(work, 'x')),
        }),
      ).rejects.toThrow(/not a Rowtally backup/);
      expect(await fingerprint(empty.url)).toEqual({});
    } finally {
      await empty.drop();
    }
  });

  it('with S3 storage, records the bucket listing instead of copying the objects', async () => {
    s3 = await startFakeS3('rowtally-backup-photos');
    await s3.storage.put('photos/t1/abc/display.webp', Buffer.from('twelve bytes'), 'image/webp');
    const { file, manifest } = await backup({
      databaseUrl: source.url,
      storage: s3.storage,
      outDir: path.join(work, 's3-archives'),
    });
    expect(manifest.storageDriver).toBe('s3');
    const listing = JSON.parse(
      execFileSync('tar', ['-xOf', file, './bucket-listing.json'], { encoding: 'utf8' }),
    ) as unknown;
    expect(listing).toEqual([{ key: 'photos/t1/abc/display.webp', bytes: 12 }]);
    expect(execFileSync('tar', ['-tf', file], { encoding: 'utf8' })).not.toContain('./photos/');
  });
});

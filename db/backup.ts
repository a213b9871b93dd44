/**
 * Backup and restore: one dated archive (a tar file) holding the database as pg_dump's custom
 * format, the photo files (local storage) or the bucket's object listing (S3), and a manifest.
 * Uses our own PostgreSQL binaries (the same ones db/pg-server.ts runs).
 */
import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import fsp from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import type { ObjectStorage } from '../server/storage/object-storage';
import { ensurePgInstalled } from './pg-server';

const DUMP_FILE = 'database.pgdump';
const MANIFEST_FILE = 'manifest.json';
const PHOTOS_DIR = 'photos';
const LISTING_FILE = 'bucket-listing.json';
const FORMAT = 'rowtally-backup/1';

export class BackupError extends Error {
  override name = 'BackupError';
}

export interface BackupManifest {
  format: typeof FORMAT;
  createdAt: string;
  storageDriver: 'local' | 's3';
  /** Keys of every stored object; for local storage their files are in the archive too. */
  objects: { key: string; bytes: number; sha256: string | null }[];
}

export interface BackupResult {
  file: string;
  manifest: BackupManifest;
}

export interface RestoreResult {
  tables: number;
  /** Photo files written back (local storage); 0 for S3, whose objects stay in the bucket. */
  photosRestored: number;
  manifest: BackupManifest;
}

function pgTool(name: 'pg_dump' | 'pg_restore', args: string[]): void {
  const bin = path.join(ensurePgInstalled(), name);
  const result = spawnSync(bin, args, { encoding: 'utf8' });
  if (result.status !== 0) {
    throw new BackupError(
      `${name} failed (exit ${result.status}): ${(result.stderr || result.stdout || String(result.error)).trim()}`,
    );
  }
}

function tar(args: string[]): void {
  const result = spawnSync('tar', args, { encoding: 'utf8' });
  if (result.status !== 0) {
    throw new BackupError(`tar failed (exit ${result.status}): ${result.stderr.trim()}`);
  }
}

async function readAll(body: NodeJS.ReadableStream): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const c of body) chunks.push(Buffer.isBuffer(c) ? c : Buffer.from(c));
  return Buffer.concat(chunks);
}

/** `rowtally-backup-2026-12-02T120501Z.tar`: sorts by time, safe in any file system. */
export function backupFileName(now: Date): string {
  const stamp = now
    .toISOString()
    .replace(/[-:]/g, '')
    .replace(/\.\d+Z$/, 'Z');
  return `rowtally-backup-${stamp}.tar`;
}

/** Writes one archive into `outDir` and returns its path and manifest. */
export async function backup(opts: {
  databaseUrl: string;
  storage: ObjectStorage;
  outDir: string;
  now?: Date;
}): Promise<BackupResult> {
  const now = opts.now ?? new Date();
  const stage = await fsp.mkdtemp(path.join(os.tmpdir(), 'rowtally-backup-'));
  try {
    pgTool('pg_dump', [
      '--format=custom',
      `--file=${path.join(stage, DUMP_FILE)}`,
      opts.databaseUrl,
    ]);
    const objects: BackupManifest['objects'] = [];
    for (const key of await opts.storage.list('')) {
      const stored = await opts.storage.get(key);
      if (!stored) continue; // removed while we listed
      if (opts.storage.driver === 'local') {
        const bytes = await readAll(stored.body);
        const file = path.join(stage, PHOTOS_DIR, ...key.split('/'));
        await fsp.mkdir(path.dirname(file), { recursive: true });
        await fsp.writeFile(file, bytes);
        const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
        objects.push({ key, bytes: bytes.length, sha256 });
      } else {
        // The bucket keeps its own copies; we record what should be there.
        stored.body.destroy();
        objects.push({ key, bytes: stored.size, sha256: null });
      }
    }
    const manifest: BackupManifest = {
      format: FORMAT,
      createdAt: now.toISOString(),
      storageDriver: opts.storage.driver,
      objects,
    };
    await fsp.writeFile(path.join(stage, MANIFEST_FILE), JSON.stringify(manifest, null, 2));
    if (opts.storage.driver === 's3') {
      await fsp.writeFile(
        path.join(stage, LISTING_FILE),
        JSON.stringify(
          objects.map(({ key, bytes }) => ({ key, bytes })),
          null,
          2,
        ),
      );
    }
    await fsp.mkdir(opts.outDir, { recursive: true });
    const file = path.join(path.resolve(opts.outDir), backupFileName(now));
    if (fs.existsSync(file)) throw new BackupError(`${file} already exists; not overwriting it.`);
    // Written beside, then renamed: a half-written archive never carries the final name.
    const partial = `${file}.part`;
    try {
      tar(['-cf', partial, '-C', stage, '.']);
      await fsp.rename(partial, file);
    } finally {
      await fsp.rm(partial, { force: true });
    }
    return { file, manifest };
  } finally {
    await fsp.rm(stage, { recursive: true, force: true });
  }
}

/** Tables, views and sequences outside PostgreSQL's own schemas. */
async function userRelations(databaseUrl: string): Promise<string[]> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query<{ name: string }>(
      `select n.nspname || '.' || c.relname as name from pg_class c
         join pg_namespace n on n.oid = c.relnamespace
        where c.relkind in ('r', 'p', 'v', 'm', 'S', 'f')
          and n.nspname not in ('pg_catalog', 'information_schema')
          and n.nspname not like 'pg\\_%'
        order by 1`,
    );
    return rows.map((r) => r.name);
  } finally {
    await client.end();
  }
}

/**
 * Restores an archive into an empty database (refuses one that holds any table) and writes the
 * photo files back through the storage driver. The database part is one transaction: a failed
 * restore leaves the database empty.
 */
export async function restore(opts: {
  file: string;
  databaseUrl: string;
  storage: ObjectStorage;
}): Promise<RestoreResult> {
  if (!fs.existsSync(opts.file)) throw new BackupError(`No such backup file: ${opts.file}`);
  const existing = await userRelations(opts.databaseUrl);
  if (existing.length > 0) {
    const dbName = new URL(opts.databaseUrl).pathname.slice(1);
    throw new BackupError(
      `The database "${dbName}" is not empty (it holds ${existing.length} tables or sequences, e.g. ${existing.slice(0, 3).join(', ')}). ` +
        'Restore only into an empty database: create a new one, or stop the app and drop this one first. Nothing was changed.',
    );
  }
  const stage = await fsp.mkdtemp(path.join(os.tmpdir(), 'rowtally-restore-'));
  try {
    tar(['-xf', path.resolve(opts.file), '-C', stage]);
    const manifestPath = path.join(stage, MANIFEST_FILE);
    if (!fs.existsSync(manifestPath) || !fs.existsSync(path.join(stage, DUMP_FILE))) {
      throw new BackupError(
        `${opts.file} is not a Rowtally backup (no ${MANIFEST_FILE} or ${DUMP_FILE}).`,
      );
    }
    const manifest = JSON.parse(await fsp.readFile(manifestPath, 'utf8')) as BackupManifest;
    if (manifest.format !== FORMAT) {
      throw new BackupError(
        `${opts.file} has an unknown backup format (${String(manifest.format)}).`,
      );
    }
    // Photo bytes are checked before anything is written, so a damaged archive changes nothing.
    const files: { key: string; bytes: Buffer }[] = [];
    if (manifest.storageDriver === 'local') {
      for (const o of manifest.objects) {
        const bytes = await fsp.readFile(path.join(stage, PHOTOS_DIR, ...o.key.split('/')));
        const sha256 = crypto.createHash('sha256').update(bytes).digest('hex');
        if (sha256 !== o.sha256)
          throw new BackupError(`The photo file ${o.key} in ${opts.file} is damaged.`);
        files.push({ key: o.key, bytes });
      }
    }
    // --clean --if-exists: a dump of a database whose public schema was re-created carries its own
    // CREATE SCHEMA public, which would otherwise collide with the empty database's one.
    pgTool('pg_restore', [
      '--no-owner',
      '--no-privileges',
      '--clean',
      '--if-exists',
      '--single-transaction',
      '--exit-on-error',
      `--dbname=${opts.databaseUrl}`,
      path.join(stage, DUMP_FILE),
    ]);
    for (const f of files) await opts.storage.put(f.key, f.bytes, 'application/octet-stream');
    const tables = (await userRelations(opts.databaseUrl)).length;
    return { tables, photosRestored: files.length, manifest };
  } finally {
    await fsp.rm(stage, { recursive: true, force: true });
  }
}

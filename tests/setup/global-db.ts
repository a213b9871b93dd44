/**
 * One throwaway PostgreSQL cluster for the whole run, on a free loopback port, in a temporary
 * folder. A migrated template database is made once; each test file clones it (see
 * tests/support/test-database.ts), so every file owns its data.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { createDb, createPool } from '../../db/database';
import { createDatabaseIfMissing } from '../../db/ensure-database';
import { migrateToLatest } from '../../db/migrator';
import { freePort, startPg, stopPg } from '../../db/pg-server';

export const TEMPLATE_DB = 'rowtally_template';

declare module 'vitest' {
  export interface ProvidedContext {
    pgServerUrl: string;
    templateDb: string;
  }
}

let dataDir: string | undefined;
let running: Promise<string> | undefined;

async function startOnce(): Promise<string> {
  const base = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-test-'));
  if (process.getuid?.() === 0) execFileSync('chown', ['postgres:postgres', base]);
  dataDir = path.join(base, 'pg');
  const server = await startPg({ dataDir, port: await freePort(), throwaway: true, log: () => {} });
  const url = server.url();
  await createDatabaseIfMissing(url, TEMPLATE_DB);
  const pool = createPool(server.url(TEMPLATE_DB), 2);
  const db = createDb(pool);
  await migrateToLatest(db);
  await db.destroy();
  return url;
}

export default async function setup(project: TestProject) {
  running ??= startOnce();
  project.provide('pgServerUrl', await running);
  project.provide('templateDb', TEMPLATE_DB);
  return async () => {
    if (!dataDir) return;
    const dir = dataDir;
    dataDir = undefined;
    stopPg(dir, () => {});
    fs.rmSync(path.dirname(dir), { recursive: true, force: true });
  };
}

/**
 * One throwaway PostgreSQL cluster for the whole run, on a free loopback port, in a temporary
 * folder. A migrated template database is made once; each test file clones it (see
 * tests/support/test-database.ts), so every file owns its data.
 *
 * Only the projects that use the database list this file (vitest.config.ts). Each project
 * loads it through its own module runner, so the cluster is kept on the process, not in this
 * module, and stopped when the last project that asked for it tears down.
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
import { installMailQueue } from '../../server/mail/mail-queue';

export const TEMPLATE_DB = 'rowtally_template';

declare module 'vitest' {
  export interface ProvidedContext {
    pgServerUrl: string;
    templateDb: string;
  }
}

interface SharedCluster {
  dataDir: string;
  url: Promise<string>;
  users: number;
}

const KEY = Symbol.for('rowtally.test-cluster');
const shared = globalThis as { [KEY]?: SharedCluster };

function startOnce(): SharedCluster {
  const base = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-test-'));
  if (process.getuid?.() === 0) execFileSync('chown', ['postgres:postgres', base]);
  const dataDir = path.join(base, 'pg');
  const url = (async () => {
    const server = await startPg({
      dataDir,
      port: await freePort(),
      throwaway: true,
      log: () => {},
    });
    await createDatabaseIfMissing(server.url(), TEMPLATE_DB);
    const pool = createPool(server.url(TEMPLATE_DB), 2);
    const db = createDb(pool);
    await migrateToLatest(db);
    // The mail queue's own tables, made once here rather than by every test app at its start.
    await installMailQueue(pool);
    await db.destroy();
    return server.url();
  })();
  return { dataDir, url, users: 0 };
}

export default async function setup(project: TestProject) {
  const cluster = (shared[KEY] ??= startOnce());
  cluster.users += 1;
  project.provide('pgServerUrl', await cluster.url);
  project.provide('templateDb', TEMPLATE_DB);
  return async () => {
    cluster.users -= 1;
    if (cluster.users > 0) return;
    delete shared[KEY];
    stopPg(cluster.dataDir, () => {});
    fs.rmSync(path.dirname(cluster.dataDir), { recursive: true, force: true });
  };
}

/** Makes sure a database server is reachable and the app's database exists; returns its URL. */
import path from 'node:path';
import pg from 'pg';
import type { Env } from '../server/env';
import { projectRoot } from '../server/env';
import { defaultDataDir, startPg } from './pg-server';

export const APP_DATABASE = 'rowtally';

export function dataDirOf(env: Env): string {
  return env.ROWTALLY_DATA_DIR ? path.resolve(env.ROWTALLY_DATA_DIR) : defaultDataDir(projectRoot);
}

export async function createDatabaseIfMissing(serverUrl: string, name: string): Promise<void> {
  const client = new pg.Client({ connectionString: serverUrl });
  await client.connect();
  try {
    const found = await client.query('select 1 from pg_database where datname = $1', [name]);
    if (found.rowCount === 0) await client.query(`create database "${name.replace(/"/g, '""')}"`);
  } finally {
    await client.end();
  }
}

/** `owner`: see `PgServerOptions.owner` (who stops the server again when they end). */
export async function ensureDatabase(
  env: Env,
  log: (m: string) => void = console.log,
  owner?: string,
): Promise<{ url: string; startedHere: boolean }> {
  if (env.DATABASE_URL) return { url: env.DATABASE_URL, startedHere: false };
  const server = await startPg({
    dataDir: dataDirOf(env),
    port: env.ROWTALLY_DB_PORT,
    log,
    owner,
  });
  if (server.started && !server.reclaimed)
    log(`PostgreSQL started on 127.0.0.1:${server.port} (data in ${server.dataDir}).`);
  await createDatabaseIfMissing(server.url(), APP_DATABASE);
  return { url: server.url(APP_DATABASE), startedHere: server.started };
}

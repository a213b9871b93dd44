/**
 * The production start, shared by `npm run start:prod` (server/main.ts) and
 * `NODE_ENV=production npm start`: the configured database and mail relay only, migrations once
 * across instances, no demo season, no mail capture, no client build. It refuses to start on a
 * configuration that would lose sessions, mail or photos.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Server } from 'node:http';
import { createDb, createPool } from '../db/database';
import { migrateToLatest } from '../db/migrator';
import { defaultClientDir } from './app';
import { parseEnv, productionProblems } from './env';
import { createRuntime } from './runtime';

export async function startProduction(source: NodeJS.ProcessEnv = process.env): Promise<void> {
  const began = performance.now();
  const env = parseEnv({ ...source, NODE_ENV: 'production' });
  const problems = productionProblems(env, source);
  if (problems.length > 0)
    throw new Error(
      `Rowtally will not start in production until these are set:\n  ${problems.join('\n  ')}`,
    );
  const databaseUrl = env.DATABASE_URL!;
  if (!fs.existsSync(path.join(defaultClientDir, 'index.html')))
    console.warn('No client build in dist/client: only the API is served. Run `npm run build`.');

  const migrationPool = createPool(databaseUrl, 1);
  const migrationDb = createDb(migrationPool);
  try {
    const applied = await migrateToLatest(migrationDb);
    if (applied.length) console.log(`Migrations applied: ${applied.length}`);
  } finally {
    await migrationDb.destroy();
  }

  const runtime = createRuntime({ env, databaseUrl });
  const server = await new Promise<Server>((resolve, reject) => {
    const s = runtime.app.listen(env.PORT, env.HOST, () => resolve(s));
    s.once('error', reject);
  });
  console.log(
    `Rowtally listening on ${env.HOST}:${env.PORT} for ${runtime.baseUrl} (ready in ${Math.round(performance.now() - began)} ms)`,
  );

  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    // Not ready from now on; finish the requests in flight and the mail being sent, then exit.
    void runtime.shutdown(server).finally(() => process.exit(0));
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

/** Runs the production start; a refusal or a failed start prints why and exits 1. */
export function runProduction(): void {
  startProduction().catch((err: unknown) => {
    console.error(err instanceof Error ? err.message : err);
    process.exit(1);
  });
}

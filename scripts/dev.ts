/**
 * npm run dev: the same database and mail capture as `npm start`, the API restarted on change
 * (tsx watch) and Vite's dev server with hot reload in front of it.
 */
import { createStorage } from '../server/storage/create-storage';
import { spawn } from 'node:child_process';
import { createDb, createPool } from '../db/database';
import { ensureDatabase } from '../db/ensure-database';
import { migrateToLatest } from '../db/migrator';
import { seedDemoIfEmpty } from '../db/seed/seed';
import { parseEnv } from '../server/env';
import { ensureSystemPackages } from './system-packages';

async function main() {
  const env = parseEnv();
  if (!env.DATABASE_URL) ensureSystemPackages(['postgresql']);
  const { url } = await ensureDatabase(env);
  const db = createDb(createPool(url, 2));
  await migrateToLatest(db);
  await seedDemoIfEmpty(db, createStorage(env));
  await db.destroy();

  const vitePort = Number(process.env.VITE_PORT ?? 5173);
  const children = [
    spawn(
      process.execPath,
      [
        'node_modules/tsx/dist/cli.mjs',
        'watch',
        '--clear-screen=false',
        'scripts/start.ts',
        '--no-build',
      ],
      {
        stdio: 'inherit',
        env: { ...process.env, DATABASE_URL: url, PUBLIC_URL: `http://127.0.0.1:${vitePort}` },
      },
    ),
    spawn(process.execPath, ['node_modules/vite/bin/vite.js'], { stdio: 'inherit' }),
  ];
  const stop = () => children.forEach((c) => c.kill('SIGTERM'));
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
  console.log(
    `\nOpen http://127.0.0.1:${vitePort} (the API runs on port ${env.PORT} behind Vite's proxy).\n`,
  );
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});

/**
 * npm start: our own database (installed and started when needed), migrations, the demo season
 * when the database is empty, a local mail capture server, the client build, then the server.
 */
import { spawnSync } from 'node:child_process';
import type { Server } from 'node:http';
import { createDb, createPool } from '../db/database';
import { dataDirOf, ensureDatabase } from '../db/ensure-database';
import { migrateToLatest } from '../db/migrator';
import { stopPg } from '../db/pg-server';
import { demoAccounts } from '../db/seed/demo-season';
import { seedDemoIfEmpty } from '../db/seed/seed';
import { parseEnv } from '../server/env';
import { type CaptureServer, startCaptureServer } from '../server/mail/capture-server';
import { mailboxBanner } from '../server/mail/mailbox-router';
import { createRuntime } from '../server/runtime';
import { createStorage } from '../server/storage/create-storage';
import { ensureSystemPackages } from './system-packages';

async function main() {
  const env = parseEnv();
  if (!env.DATABASE_URL) ensureSystemPackages(['postgresql']);
  const { url: databaseUrl, startedHere } = await ensureDatabase(env);
  {
    const pool = createPool(databaseUrl, 2);
    const db = createDb(pool);
    const applied = await migrateToLatest(db);
    if (applied.length) console.log(`Migrations applied: ${applied.length}`);
    if (await seedDemoIfEmpty(db, createStorage(env)))
      console.log('Loaded the demo season (Larkhaven Seed Library).');
    await db.destroy();
  }

  let mailbox: CaptureServer | undefined;
  if (env.NODE_ENV !== 'production' && env.SMTP_HOST === '127.0.0.1' && !env.SMTP_USER) {
    mailbox = await startCaptureServer(env.SMTP_PORT);
  }

  if (!process.argv.includes('--no-build')) {
    console.log('Building the client…');
    const build = spawnSync(
      process.execPath,
      ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'],
      { stdio: 'inherit' },
    );
    if (build.status !== 0) throw new Error('The client build failed.');
  }

  const runtime = createRuntime({ env, databaseUrl, mailbox });
  const server: Server = await new Promise((resolve, reject) => {
    const s = runtime.app.listen(env.PORT, env.HOST, () => resolve(s));
    s.once('error', (err: NodeJS.ErrnoException) =>
      reject(
        err.code === 'EADDRINUSE'
          ? new Error(`Port ${env.PORT} is taken; set PORT to a free port.`)
          : err,
      ),
    );
  });

  const url = runtime.baseUrl;
  console.log(`\nRowtally is running at ${url}\n`);
  if (mailbox) console.log(`${mailboxBanner(url, mailbox.port)}\n`);
  console.log('Demo sign-ins (Larkhaven Seed Library, season 2026):');
  for (const a of demoAccounts)
    console.log(`  ${a.key.padEnd(12)} ${a.email.padEnd(36)} ${a.password}`);
  console.log('\nPress Ctrl+C to stop.');

  const stop = async () => {
    server.close();
    await mailbox?.close();
    await runtime.close();
    if (startedHere) stopPg(dataDirOf(env), () => {});
    process.exit(0);
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});

/**
 * npm start: our own database (installed and started when needed), migrations, the demo season
 * when the database is empty, a local mail capture server, the client build, then the server.
 * With NODE_ENV=production it is the production start instead (server/production.ts): none of
 * the above, and the same refusals as `npm run start:prod`.
 */
import type { ChildProcess } from 'node:child_process';
import type { Server } from 'node:http';
import { createDb, createPool } from '../db/database';
import { dataDirOf, ensureDatabase } from '../db/ensure-database';
import { migrateToLatest } from '../db/migrator';
import { stopPg } from '../db/pg-server';
import { seedDemoIfEmpty } from '../db/seed/seed';
import { parseEnv } from '../server/env';
import { type CaptureServer, startCaptureServer } from '../server/mail/capture-server';
import { mailboxBanner } from '../server/mail/mailbox-router';
import { runProduction } from '../server/production';
import { createRuntime, type Runtime } from '../server/runtime';
import { createStorage } from '../server/storage/create-storage';
import { buildWithProgress } from './build-progress';
import { printDemoSignIns } from './demo-sign-ins';
import { ensureSystemPackages } from './system-packages';

/** Marks the PostgreSQL server this command starts, so a later `npm start` knows it as its own. */
const OWNER = 'npm start';
/** Requests in flight get this long to finish when the command is stopped. */
const REQUEST_GRACE_MS = 10_000;
/** How long the app may take to close before the database is stopped regardless. */
const CLOSE_GRACE_MS = 25_000;

/** What is running so far; whatever is set is closed on the way out, the database last. */
const running: {
  dataDir?: string;
  build?: ChildProcess;
  server?: Server;
  mailbox?: CaptureServer;
  runtime?: Runtime;
} = {};
let stopping = false;

/**
 * Stops what this command started, on Ctrl+C (SIGINT), SIGTERM or a failed start: the build,
 * the web server (letting requests in flight finish), the mail worker (letting the message it
 * sends finish), the mail capture, the app's connections, then our own PostgreSQL. A second
 * signal skips the waiting but still stops the database.
 */
async function shutdown(code: number) {
  if (stopping) {
    stopDatabase();
    process.exit(code);
  }
  stopping = true;
  running.build?.kill('SIGTERM');
  const closing = (async () => {
    // Requests in flight and the mail being sent finish first; the capture server after them.
    await running.runtime?.shutdown(running.server, REQUEST_GRACE_MS);
    await running.mailbox?.close();
  })().catch((err: unknown) => console.error(err instanceof Error ? err.message : err));
  await Promise.race([closing, new Promise((resolve) => setTimeout(resolve, CLOSE_GRACE_MS))]);
  stopDatabase();
  process.exit(code);
}

function stopDatabase() {
  const dataDir = running.dataDir;
  running.dataDir = undefined;
  if (dataDir) stopPg(dataDir);
}

/** `vite build` with a line every few seconds, so a slow machine does not look stuck. */
function buildClient(): Promise<void> {
  return buildWithProgress({
    what: 'the client',
    command: process.execPath,
    args: ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'],
    onSpawn: (build) => {
      running.build = build;
      build.once('exit', () => (running.build = undefined));
    },
  });
}

async function main() {
  // Before anything is started, so an interruption at any step stops what was started.
  process.on('SIGINT', () => void shutdown(130));
  process.on('SIGTERM', () => void shutdown(143));

  const env = parseEnv();
  if (!env.DATABASE_URL) ensureSystemPackages(['postgresql']);
  const { url: databaseUrl, startedHere } = await ensureDatabase(env, console.log, OWNER);
  if (startedHere) running.dataDir = dataDirOf(env);
  if (stopping) return;
  {
    const pool = createPool(databaseUrl, 2);
    const db = createDb(pool);
    try {
      const applied = await migrateToLatest(db);
      if (applied.length) console.log(`Migrations applied: ${applied.length}`);
      if (await seedDemoIfEmpty(db, createStorage(env)))
        console.log('Loaded the demo season (Larkhaven Seed Library).');
    } finally {
      await db.destroy();
    }
  }
  if (stopping) return;

  if (env.NODE_ENV !== 'production' && env.SMTP_HOST === '127.0.0.1' && !env.SMTP_USER) {
    running.mailbox = await startCaptureServer(env.SMTP_PORT);
  }
  const mailbox = running.mailbox;

  if (!process.argv.includes('--no-build')) await buildClient();
  if (stopping) return;

  const runtime = createRuntime({ env, databaseUrl, mailbox });
  running.runtime = runtime;
  running.server = await new Promise<Server>((resolve, reject) => {
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
  printDemoSignIns();
  console.log('\nPress Ctrl+C to stop.');
}

if (process.env.NODE_ENV === 'production') runProduction();
else main().catch(failedStart);

function failedStart(err: unknown) {
  if (stopping) return;
  console.error(err instanceof Error ? err.message : err);
  void shutdown(1);
}

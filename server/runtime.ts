/** Builds everything the app needs from the parsed environment; used by start, dev and tests. */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import pino, { type Logger } from 'pino';
import { createDb, createPool } from '../db/database';
import type { Server } from 'node:http';
import { createApp, defaultClientDir } from './app';
import { drainHttp } from './lib/drain-http';
import type { AppDeps } from './app-deps';
import { createAuth } from './auth/auth';
import { type Env, projectRoot } from './env';
import type { CaptureServer } from './mail/capture-server';
import { createMailQueue } from './mail/mail-queue';
import { createMailer, type Mailer } from './mail/mailer';
import { purgeDeletedPhotos } from './photos/photos-service';
import { closeAnalysisPool, setAnalysisTimeLimit } from './analysis/analysis-pool';
import { createStorage } from './storage/create-storage';
import type { ObjectStorage } from './storage/object-storage';

export const appVersion: string = JSON.parse(
  fs.readFileSync(path.join(projectRoot, 'package.json'), 'utf8'),
).version;

/** A development secret kept beside the data so sessions survive restarts; production must set one. */
function authSecret(env: Env): string {
  if (env.AUTH_SECRET) return env.AUTH_SECRET;
  if (env.NODE_ENV === 'production')
    throw new Error('AUTH_SECRET must be set (32+ characters) in production.');
  if (env.NODE_ENV === 'test') return 'test-secret-not-for-use-anywhere-else-0123456789';
  const file = path.join(projectRoot, '.data', 'auth-secret');
  if (!fs.existsSync(file)) {
    fs.mkdirSync(path.dirname(file), { recursive: true });
    fs.writeFileSync(file, crypto.randomBytes(32).toString('hex'), { mode: 0o600 });
  }
  return fs.readFileSync(file, 'utf8').trim();
}

export interface RuntimeOptions {
  env: Env;
  databaseUrl: string;
  logger?: Logger;
  /** What hands mail to the relay (SMTP from the environment by default). */
  mailer?: Mailer;
  /** Send queued mail from this process (default); off, it only writes to the queue. */
  mailWorker?: boolean;
  mailbox?: CaptureServer;
  baseUrl?: string;
  clientDir?: string;
  /** Photo storage; by default the driver the environment names. */
  storage?: ObjectStorage;
}

/** Deleted photos' files are removed once the undo window has passed; checked this often. */
const PHOTO_PURGE_INTERVAL_MS = 15 * 60 * 1000;

export function createRuntime(opts: RuntimeOptions) {
  const { env } = opts;
  const logger =
    opts.logger ??
    pino({
      level: env.LOG_LEVEL,
      redact: ['req.headers.cookie', 'req.headers.authorization', 'res.headers["set-cookie"]'],
    });
  const pool = createPool(opts.databaseUrl, env.DB_POOL_MAX, (err) =>
    logger.warn({ err }, 'a database connection was lost; the next query opens a new one'),
  );
  const db = createDb(pool);
  setAnalysisTimeLimit(env.ANALYSIS_TIME_LIMIT_MS);
  const mail = createMailQueue({
    pool,
    db,
    env,
    logger,
    transport: opts.mailer ?? createMailer(env, logger),
    work: opts.mailWorker,
  });
  const baseUrl = opts.baseUrl ?? env.PUBLIC_URL ?? `http://${env.HOST}:${env.PORT}`;
  const auth = createAuth({ pool, db, env, mail, logger, baseUrl, secret: authSecret(env) });
  const deps: AppDeps = {
    db,
    env,
    logger,
    version: appVersion,
    auth,
    mail,
    baseUrl,
    mailbox: opts.mailbox,
    lifecycle: { draining: false },
    clientDir: opts.clientDir ?? defaultClientDir,
    storage: opts.storage ?? createStorage(env),
  };
  // Tests run the purge themselves, with the clock they choose.
  const purgeTimer =
    env.NODE_ENV === 'test'
      ? null
      : setInterval(() => {
          purgeDeletedPhotos({ db, storage: deps.storage }).catch((err: unknown) =>
            logger.warn({ err }, 'removing deleted photos failed; will try again'),
          );
        }, PHOTO_PURGE_INTERVAL_MS).unref();
  const close = async () => {
    if (purgeTimer) clearInterval(purgeTimer);
    await mail.stop();
    await closeAnalysisPool();
    await db.destroy();
  };
  return {
    deps,
    app: createApp(deps),
    pool,
    db,
    auth,
    mail,
    baseUrl,
    /** Stops the mail worker (letting a message being sent finish), then the rest. */
    close,
    /**
     * On SIGTERM: /api/ready answers 503 at once, the web server takes no new connections and
     * lets requests in flight finish (up to `graceMs`), then the mail worker finishes the
     * message it is sending, and the connections close.
     */
    async shutdown(server: Server | undefined, graceMs = 10_000) {
      deps.lifecycle.draining = true;
      if (server) await drainHttp(server, graceMs);
      await close();
    },
  };
}
export type Runtime = ReturnType<typeof createRuntime>;

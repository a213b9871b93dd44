/**
 * What the app is built from (server/runtime.ts wires it from the environment; tests give their
 * own). Its own module so routers can name it without importing the app that mounts them.
 */
import type { Logger } from 'pino';
import type { DB } from '../db/database';
import type { Auth } from './auth/auth';
import type { Env } from './env';
import type { CaptureServer } from './mail/capture-server';
import type { MailQueue } from './mail/mail-queue';
import type { ObjectStorage } from './storage/object-storage';

export interface AppDeps {
  db: DB;
  env: Env;
  logger: Logger;
  version: string;
  auth: Auth;
  /** Outgoing mail, queued in the database; the sign-in library has its own reference. */
  mail: MailQueue;
  /** The address people reach the app at; links in mail are built from it. */
  baseUrl: string;
  /** Where photo files live (server/storage: the local folder or S3, from STORAGE_DRIVER). */
  storage: ObjectStorage;
  /** The local capture server's messages, listed at /dev/mailbox outside production. */
  mailbox?: CaptureServer;
  /** Set while the process shuts down: /api/ready answers 503 so no new work is routed here. */
  lifecycle: { draining: boolean };
  /** Serve the built client from this folder (production). */
  clientDir?: string;
}

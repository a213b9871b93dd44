/** The real app on a test file's own database, with a real SMTP capture server. */
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { hashPassword } from 'better-auth/crypto';
import pino from 'pino';
import request from 'supertest';
import type { DB } from '../../db/database';
import { parseEnv } from '../../server/env';
import { type CaptureServer, startCaptureServer } from '../../server/mail/capture-server';
import { createSmtpMailer } from '../../server/mail/mailer';
import { createRuntime, type Runtime } from '../../server/runtime';
import type { ObjectStorage } from '../../server/storage/object-storage';
import { createTestDatabase, type TestDatabase } from './test-database';

export const TEST_ORIGIN = 'http://127.0.0.1:3999';

export interface TestApp {
  runtime: Runtime;
  app: Runtime['app'];
  db: DB;
  database: TestDatabase;
  mailbox: CaptureServer;
  close(): Promise<void>;
}

export async function createTestApp(
  opts: { clientDir?: string; baseUrl?: string; port?: number; storage?: ObjectStorage } = {},
): Promise<TestApp> {
  const database = await createTestDatabase();
  // Each test app keeps its photo files in a folder of its own, removed on close.
  const uploadsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-uploads-'));
  const mailbox = await startCaptureServer(0);
  const env = parseEnv({
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    SMTP_PORT: String(mailbox.port),
    PORT: String(opts.port ?? 3999),
    UPLOADS_DIR: uploadsDir,
  });
  const logger = pino({ level: 'silent' });
  const runtime = createRuntime({
    env,
    databaseUrl: database.url,
    logger,
    mailer: createSmtpMailer(env, logger, [50, 100]),
    mailbox,
    baseUrl: opts.baseUrl ?? TEST_ORIGIN,
    clientDir: opts.clientDir ?? '/nonexistent',
    storage: opts.storage,
  });
  return {
    runtime,
    app: runtime.app,
    db: runtime.db,
    database,
    mailbox,
    async close() {
      await mailbox.close();
      await runtime.pool.end().catch(() => {});
      await database.drop();
      fs.rmSync(uploadsDir, { recursive: true, force: true });
    },
  };
}

export interface TestUser {
  id: string;
  email: string;
  password: string;
  name: string;
}

/** A verified user with a password, written straight to the database. */
export async function createUser(
  db: DB,
  overrides: Partial<TestUser> & { isAdmin?: boolean } = {},
): Promise<TestUser> {
  const id = crypto.randomUUID();
  const email = overrides.email ?? `user-${id.slice(0, 8)}@test.example`;
  const password = overrides.password ?? 'correct-horse-battery';
  const name = overrides.name ?? 'Test Grower';
  await db
    .insertInto('users')
    .values({
      id,
      name,
      email,
      email_verified: true,
      is_admin: overrides.isAdmin ?? false,
      created_at: new Date(),
      updated_at: new Date(),
    })
    .execute();
  await db
    .insertInto('accounts')
    .values({
      id: crypto.randomUUID(),
      account_id: id,
      provider_id: 'credential',
      user_id: id,
      password: await hashPassword(password),
      created_at: new Date(),
      updated_at: new Date(),
    })
    .execute();
  return { id, email, password, name };
}

/** Signs in through the real sign-in endpoint and returns an agent that carries the cookie. */
export async function signedInAgent(t: TestApp, user: Pick<TestUser, 'email' | 'password'>) {
  const agent = request.agent(t.app);
  const res = await agent
    .post('/api/auth/sign-in/email')
    .set('Origin', TEST_ORIGIN)
    .set(
      'X-Forwarded-For',
      `10.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}.1`,
    )
    .send({ email: user.email, password: user.password });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${res.text}`);
  return agent;
}

/** A session cookie minted without HTTP (no rate limit in the way), for tests and browser fixtures. */
export async function mintSessionCookie(
  t: TestApp,
  user: Pick<TestUser, 'email' | 'password'>,
): Promise<string> {
  const { headers } = await t.runtime.auth.api.signInEmail({
    body: { email: user.email, password: user.password },
    returnHeaders: true,
  });
  const setCookie = headers.get('set-cookie');
  if (!setCookie) throw new Error('No session cookie was minted.');
  return setCookie.split(';')[0]!;
}

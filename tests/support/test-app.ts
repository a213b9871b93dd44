/** The real app on a test file's own database, with a real SMTP capture server. */
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { hashPassword, makeSignature } from 'better-auth/crypto';
import pino from 'pino';
import request from 'supertest';
import type { DB } from '../../db/database';
import { parseEnv } from '../../server/env';
import { type CaptureServer, startCaptureServer } from '../../server/mail/capture-server';
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
  /** Resolves once the mail queue holds nothing waiting (so every message sent has arrived). */
  mailSettled(timeoutMs?: number): Promise<void>;
  close(): Promise<void>;
}

export async function createTestApp(
  opts: {
    clientDir?: string;
    baseUrl?: string;
    port?: number;
    storage?: ObjectStorage;
    /** More environment variables (limits a test wants small). */
    env?: Record<string, string>;
  } = {},
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
    // A refused message is retried after about a second, twice, then marked failed.
    MAIL_RETRY_DELAY_SECONDS: '1',
    MAIL_RETRY_LIMIT: '2',
    ...opts.env,
  });
  const logger = pino({ level: 'silent' });
  const runtime = createRuntime({
    env,
    databaseUrl: database.url,
    logger,
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
    async mailSettled(timeoutMs = 10_000) {
      const until = Date.now() + timeoutMs;
      for (;;) {
        const { n } = await runtime.db
          .selectFrom('outgoing_mail')
          .select((eb) => eb.fn.countAll<number>().as('n'))
          .where('status', '=', 'pending')
          .executeTakeFirstOrThrow();
        if (Number(n) === 0) return;
        if (Date.now() > until) throw new Error(`${n} messages still waiting in the mail queue.`);
        await new Promise((resolve) => setTimeout(resolve, 100));
      }
    },
    async close() {
      await runtime.mail.stop();
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

/** Every test user's password unless a test chooses another. */
export const TEST_PASSWORD = 'correct-horse-battery';
/**
 * TEST_PASSWORD hashed once with the library's own hashPassword (scrypt, random salt). Hashing
 * costs about 100 ms of CPU per user, which made tests with many users slow and, on a busy
 * machine, late; sign-in tests still verify it through the real endpoint.
 */
const TEST_PASSWORD_HASH =
  'fd03237c063a86415408c215d7de8a02:db5309c7a65e0cf1c93a2fb6afcd8725f9657071c79290dcdef6cc750c086e1768cde1a220b22d85968819a59249a160245a0dd9dd43b745506b3ba1019c0864';
const otherHashes = new Map<string, Promise<string>>();
function passwordHash(password: string): Promise<string> {
  if (password === TEST_PASSWORD) return Promise.resolve(TEST_PASSWORD_HASH);
  let hash = otherHashes.get(password);
  if (!hash) otherHashes.set(password, (hash = hashPassword(password)));
  return hash;
}

/** A verified user with a password, written straight to the database. */
export async function createUser(
  db: DB,
  overrides: Partial<TestUser> & { isAdmin?: boolean } = {},
): Promise<TestUser> {
  const id = crypto.randomUUID();
  const email = overrides.email ?? `user-${id.slice(0, 8)}@test.example`;
  const password = overrides.password ?? TEST_PASSWORD;
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
      password: await passwordHash(password),
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

/**
 * A session cookie for a user, with the session written through the library's own adapter and
 * the cookie signed as the library signs it: no HTTP, no password check, no rate limit, so a
 * test with many users does not spend its time (or its timeout) on hashing.
 */
export async function mintSessionCookie(
  t: Pick<TestApp, 'runtime' | 'db'>,
  user: Pick<TestUser, 'email'>,
): Promise<string> {
  const { id } = await t.db
    .selectFrom('users')
    .select('id')
    .where((eb) => eb(eb.fn('lower', ['email']), '=', user.email.toLowerCase()))
    .executeTakeFirstOrThrow();
  const ctx = await t.runtime.auth.$context;
  const session = await ctx.internalAdapter.createSession(id);
  const signed = `${session.token}.${await makeSignature(session.token, ctx.secret)}`;
  return `${ctx.authCookies.sessionToken.name}=${encodeURIComponent(signed)}`;
}

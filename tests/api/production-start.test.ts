/**
 * `NODE_ENV=production npm start` takes the production path, as `npm run start:prod` does: it
 * refuses an incomplete configuration naming each variable, starts no database, mail capture or
 * demo season of its own, builds no client, migrates the database it is given, and stops on
 * SIGTERM. What production requires is this product's own rule (no outside source).
 */
import { type ChildProcess, spawn } from 'node:child_process';
import crypto from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort, isPortFree } from '../../db/pg-server';
import { createEmptyDatabase, type TestDatabase } from '../support/test-database';

const SECRET = crypto.randomBytes(32).toString('hex');
const started: ChildProcess[] = [];
let database: TestDatabase;

beforeAll(async () => {
  database = await createEmptyDatabase();
});

afterAll(async () => {
  for (const child of started) if (child.exitCode === null) child.kill('SIGKILL');
  await database?.drop();
});

/** `npm start` with only these variables (and PATH/HOME); resolves on `ready` text or exit. */
function npmStart(vars: Record<string, string>) {
  const child = spawn('npm', ['start', '--silent'], {
    env: { PATH: process.env.PATH, HOME: process.env.HOME, NODE_ENV: 'production', ...vars },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  started.push(child);
  let output = '';
  child.stdout!.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (output += d.toString()));
  const exited = new Promise<number | null>((resolve) =>
    child.once('close', (code) => resolve(code)),
  );
  const listening = () =>
    new Promise<void>((resolve, reject) => {
      const timer = setInterval(() => {
        if (output.includes('Rowtally listening')) {
          clearInterval(timer);
          resolve();
        } else if (child.exitCode !== null) {
          clearInterval(timer);
          reject(new Error(`npm start ended:\n${output}`));
        }
      }, 100);
    });
  return { child, exited, listening, output: () => output };
}

describe('NODE_ENV=production npm start', () => {
  it('refuses to start without the shared secret, address, database and a mail relay, naming each', async () => {
    const app = npmStart({ PORT: String(await freePort()) });
    expect(await app.exited).toBe(1);
    const out = app.output();
    for (const name of ['AUTH_SECRET', 'PUBLIC_URL', 'DATABASE_URL', 'SMTP_HOST'])
      expect(out).toContain(`${name}:`);
    // The development path would have started its own PostgreSQL and built the client.
    expect(out).not.toContain('PostgreSQL started');
    expect(out).not.toContain('Building the client');
  }, 120_000);

  it('refuses several instances on one host folder of photos', async () => {
    const app = npmStart({
      AUTH_SECRET: SECRET,
      PUBLIC_URL: 'http://127.0.0.1:8000',
      DATABASE_URL: database.url,
      MAIL_DRIVER: 'off',
      INSTANCE_COUNT: '2',
      PORT: String(await freePort()),
    });
    expect(await app.exited).toBe(1);
    expect(app.output()).toContain('STORAGE_DRIVER: 2 instances need STORAGE_DRIVER=s3');
  }, 120_000);

  it('with a complete configuration migrates, serves, loads no demo, runs no mail capture, and stops on SIGTERM', async () => {
    const port = await freePort();
    const smtpPort = await freePort();
    const app = npmStart({
      AUTH_SECRET: SECRET,
      PUBLIC_URL: `http://127.0.0.1:${port}`,
      DATABASE_URL: database.url,
      // A relay named on loopback: the development path would put its capture server there.
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: String(smtpPort),
      PORT: String(port),
      LOG_LEVEL: 'warn',
    });
    await app.listening();
    const base = `http://127.0.0.1:${port}`;
    expect((await fetch(`${base}/api/ready`)).status).toBe(200);
    expect(app.output()).toMatch(/Migrations applied: \d+/);
    expect(app.output()).not.toContain('Demo sign-ins');
    expect(await isPortFree(smtpPort)).toBe(true);
    expect((await fetch(`${base}/api/dev/mailbox`)).status).toBe(404);
    const trials = await database.db
      .selectFrom('trials')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .executeTakeFirstOrThrow();
    expect(Number(trials.n)).toBe(0);

    // To npm alone, as a container runtime sends it to its first process: the server must get it.
    app.child.kill('SIGTERM');
    expect(await app.exited).toBe(0);
    expect(app.output()).not.toContain('Error');
  }, 120_000);
});

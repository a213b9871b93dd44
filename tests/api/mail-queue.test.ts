/**
 * Mail that cannot be lost: every message is queued in PostgreSQL and sent by a worker through
 * a real SMTP server on loopback. With the relay down the message waits (retried), survives a
 * restart of the app, and is delivered exactly once when the relay is back; after the last
 * retry it is marked failed and a resend delivers it. The lead sees what their trial's mail did.
 */
import crypto from 'node:crypto';
import pino from 'pino';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort } from '../../db/pg-server';
import { parseEnv } from '../../server/env';
import { type CaptureServer, startCaptureServer } from '../../server/mail/capture-server';
import { createRuntime, type Runtime } from '../../server/runtime';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { createUser, mintSessionCookie, TEST_ORIGIN } from '../support/test-app';

let database: TestDatabase;
let relayPort: number;
const running = new Set<Runtime>();
let relay: CaptureServer | null = null;

/** An app process on the test database whose relay is the (maybe absent) server on relayPort. */
function startApp(env: Record<string, string> = {}) {
  const runtime = createRuntime({
    env: parseEnv({
      NODE_ENV: 'test',
      LOG_LEVEL: 'silent',
      SMTP_PORT: String(relayPort),
      MAIL_RETRY_DELAY_SECONDS: '1',
      MAIL_RETRY_LIMIT: '5',
      ...env,
    }),
    databaseUrl: database.url,
    logger: pino({ level: 'silent' }),
    baseUrl: TEST_ORIGIN,
    clientDir: '/nonexistent',
  });
  running.add(runtime);
  return runtime;
}

async function stopApp(runtime: Runtime) {
  running.delete(runtime);
  await runtime.close();
}

beforeAll(async () => {
  database = await createTestDatabase();
  relayPort = await freePort();
});
afterAll(async () => {
  for (const r of running) await r.close().catch(() => {});
  await relay?.close();
  await database.drop();
});

const uniqueEmail = (label: string) => `${label}-${crypto.randomUUID().slice(0, 8)}@test.example`;

async function trialWithLead(runtime: Runtime) {
  const slug = `mail-${crypto.randomUUID().slice(0, 8)}`;
  const trial = await database.db
    .insertInto('trials')
    .values({
      slug,
      title: 'Runner beans at Quarrel Lane',
      crop: 'Runner bean',
      season: '2026',
      design: 'rcbd',
      status: 'active',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  const lead = await createUser(database.db, { name: 'Perpetua Wolde' });
  const grower = await createUser(database.db, { name: 'Anselm Fairweather' });
  await database.db
    .insertInto('trial_members')
    .values([
      { trial_id: trial.id, user_id: lead.id, role: 'lead' },
      { trial_id: trial.id, user_id: grower.id, role: 'grower' },
    ])
    .execute();
  return {
    id: trial.id,
    slug,
    leadCookie: await mintSessionCookie({ runtime, db: database.db }, lead),
    growerCookie: await mintSessionCookie({ runtime, db: database.db }, grower),
  };
}

function api(runtime: Runtime, cookie: string) {
  return {
    get: (url: string) =>
      request(runtime.app).get(url).set('Origin', TEST_ORIGIN).set('Cookie', cookie),
    post: (url: string, body?: object) =>
      request(runtime.app)
        .post(url)
        .set('Origin', TEST_ORIGIN)
        .set('Cookie', cookie)
        .send(body ?? {}),
  };
}

function mailRow(id: string) {
  return database.db
    .selectFrom('outgoing_mail')
    .selectAll()
    .where('invitation_id', '=', id)
    .orderBy('created_at', 'desc')
    .executeTakeFirstOrThrow();
}

const delivered = (email: string) => relay!.messages().filter((m) => m.to.includes(email));

describe('with the relay down', () => {
  it('keeps the message queued across an app restart and delivers it once when the relay is back', async () => {
    const first = startApp();
    const trial = await trialWithLead(first);
    const email = uniqueEmail('waiting');
    const created = await api(first, trial.leadCookie).post(
      `/api/trials/${trial.slug}/invitations`,
      { email, role: 'viewer' },
    );
    // The lead does not wait for the relay: the answer comes at once, with the letter queued.
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ mailStatus: 'pending', sendAttempts: 1 });

    // The worker tried, the relay refused the connection, and the message waits for a retry.
    await expect
      .poll(async () => (await mailRow(created.body.id)).attempts, { timeout: 10_000 })
      .toBeGreaterThanOrEqual(1);
    const waiting = await mailRow(created.body.id);
    expect(waiting).toMatchObject({ status: 'pending', kind: 'invitation', trial_id: trial.id });
    expect(waiting.last_error).toMatch(/ECONNREFUSED/);
    expect(waiting.body).not.toBeNull();

    const seen = await api(first, trial.leadCookie).get(`/api/trials/${trial.slug}/mail`);
    expect(seen.status).toBe(200);
    expect(seen.body.counts).toEqual({ pending: 1, sent: 0, failed: 0 });
    expect(seen.body.mail[0]).toMatchObject({
      kind: 'invitation',
      recipient: email,
      status: 'pending',
      sentAt: null,
    });
    expect(seen.body.mail[0].lastError).toMatch(/ECONNREFUSED/);

    // The app stops (a deploy, a crash recovery); then the relay comes back, then a new app.
    await stopApp(first);
    relay = await startCaptureServer(relayPort);
    const second = startApp();
    const mail = await relay.waitFor((m) => m.to.includes(email), 20_000);
    expect(mail.subject).toContain('Runner beans at Quarrel Lane');

    await expect
      .poll(async () => (await mailRow(created.body.id)).status, { timeout: 10_000 })
      .toBe('sent');
    const sent = await mailRow(created.body.id);
    expect(sent.sent_at).not.toBeNull();
    expect(sent.attempts).toBe(waiting.attempts + 1);
    // Once sent, the letter's link is no longer kept in the database.
    expect(sent.body).toBeNull();
    const list = await api(second, trial.leadCookie).get(`/api/trials/${trial.slug}/invitations`);
    expect(list.body.invitations[0]).toMatchObject({ mailStatus: 'sent' });
    expect(list.body.invitations[0].lastSentAt).not.toBeNull();

    // Past the next retry's time, still one copy.
    await new Promise((resolve) => setTimeout(resolve, 2500));
    expect(delivered(email)).toHaveLength(1);
    await stopApp(second);
  }, 60_000);
});

describe('with two app processes on one queue', () => {
  it('sends each message once, whichever process takes it', async () => {
    relay ??= await startCaptureServer(relayPort);
    const a = startApp();
    const b = startApp();
    const trial = await trialWithLead(a);
    const emails = Array.from({ length: 8 }, (_, i) => uniqueEmail(`pair${i}`));
    for (const [i, email] of emails.entries()) {
      const res = await api(i % 2 ? a : b, trial.leadCookie).post(
        `/api/trials/${trial.slug}/invitations`,
        { email, role: 'viewer' },
      );
      expect(res.status).toBe(201);
    }
    for (const email of emails) await relay.waitFor((m) => m.to.includes(email), 20_000);
    await new Promise((resolve) => setTimeout(resolve, 1500));
    for (const email of emails) expect(delivered(email)).toHaveLength(1);
    const seen = await api(a, trial.leadCookie).get(`/api/trials/${trial.slug}/mail`);
    expect(seen.body.counts).toEqual({ pending: 0, sent: 8, failed: 0 });
    await Promise.all([stopApp(a), stopApp(b)]);
  }, 60_000);
});

describe('after the last retry', () => {
  it('marks the message failed for the lead, and a resend delivers a new letter', async () => {
    await relay?.close();
    relay = null;
    const app = startApp({ MAIL_RETRY_LIMIT: '1' });
    const trial = await trialWithLead(app);
    const email = uniqueEmail('given-up');
    const lead = api(app, trial.leadCookie);
    const created = await lead.post(`/api/trials/${trial.slug}/invitations`, {
      email,
      role: 'grower',
    });
    expect(created.status).toBe(201);
    // One attempt and one retry (about 1–2 s later), then given up.
    await expect
      .poll(async () => (await mailRow(created.body.id)).status, { timeout: 15_000 })
      .toBe('failed');
    const failed = await mailRow(created.body.id);
    expect(failed).toMatchObject({ attempts: 2, sent_at: null, body: null });

    const seen = await lead.get(`/api/trials/${trial.slug}/mail?status=failed`);
    expect(seen.body.counts).toEqual({ pending: 0, sent: 0, failed: 1 });
    expect(seen.body.mail).toHaveLength(1);
    expect(seen.body.mail[0]).toMatchObject({ status: 'failed', attempts: 2, recipient: email });
    const list = await lead.get(`/api/trials/${trial.slug}/invitations`);
    expect(list.body.invitations[0]).toMatchObject({ mailStatus: 'failed', lastSentAt: null });

    relay = await startCaptureServer(relayPort);
    const resent = await lead.post(
      `/api/trials/${trial.slug}/invitations/${created.body.id}/resend`,
    );
    expect(resent.body).toMatchObject({ mailStatus: 'pending', sendAttempts: 2 });
    await relay.waitFor((m) => m.to.includes(email), 10_000);
    await expect
      .poll(async () => (await lead.get(`/api/trials/${trial.slug}/mail`)).body.counts)
      .toEqual({ pending: 0, sent: 1, failed: 1 });
    await stopApp(app);
  }, 60_000);
});

describe("who sees a trial's mail", () => {
  it('is the lead: a grower is refused; to a signed-out caller the private trial does not exist', async () => {
    const app = startApp();
    const trial = await trialWithLead(app);
    expect((await api(app, trial.growerCookie).get(`/api/trials/${trial.slug}/mail`)).status).toBe(
      403,
    );
    expect((await request(app.app).get(`/api/trials/${trial.slug}/mail`)).status).toBe(404);
    const bad = await api(app, trial.leadCookie).get(`/api/trials/${trial.slug}/mail?status=lost`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields[0].path).toBe('query.status');
    await stopApp(app);
  });
});

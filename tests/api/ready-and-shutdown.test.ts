/**
 * /api/ready says whether this process should be sent requests (database and photo storage
 * reachable, not shutting down), apart from /api/health. Shutting down lets the requests in
 * flight finish and the mail worker finish the message it is handing to the relay, and takes
 * no new work meanwhile.
 */
import type { AddressInfo } from 'node:net';
import http from 'node:http';
import pino from 'pino';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseEnv } from '../../server/env';
import type { OutgoingMail } from '../../server/mail/mailer';
import { createRuntime } from '../../server/runtime';
import { localStorage } from '../../server/storage/local-storage';
import type { ObjectStorage } from '../../server/storage/object-storage';
import { createTestApp, TEST_ORIGIN, type TestApp } from '../support/test-app';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

describe('/api/ready', () => {
  let t: TestApp;
  let storageDown = false;
  beforeAll(async () => {
    const holder: { inner?: ObjectStorage } = {};
    const storage: ObjectStorage = {
      driver: 'local',
      put: (k, b, c) => holder.inner!.put(k, b, c),
      get: (k) => holder.inner!.get(k),
      delete: (k) => holder.inner!.delete(k),
      list: (p) => holder.inner!.list(p),
      check: async () => {
        if (storageDown) throw new Error('EACCES (simulated)');
        await holder.inner!.check();
      },
    };
    t = await createTestApp({ storage });
    holder.inner = localStorage(t.runtime.deps.env.UPLOADS_DIR);
  });
  afterAll(async () => {
    await t.close();
  });

  it('answers 200 when the database and the photo storage answer', async () => {
    const res = await request(t.app).get('/api/ready');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      status: 'ready',
      database: { reachable: true },
      storage: { driver: 'local', reachable: true },
    });
  });

  it('answers 503 naming the storage when it cannot be reached, while /api/health stays 200', async () => {
    storageDown = true;
    try {
      const res = await request(t.app).get('/api/ready');
      expect(res.status).toBe(503);
      expect(res.body).toMatchObject({
        status: 'not_ready',
        database: { reachable: true },
        storage: { reachable: false },
      });
      expect((await request(t.app).get('/api/health')).status).toBe(200);
    } finally {
      storageDown = false;
    }
  });
});

describe('shutting down', () => {
  let database: TestDatabase;
  beforeAll(async () => {
    database = await createTestDatabase();
  });
  afterAll(async () => {
    await database.drop();
  });

  it('finishes the request in flight and the message being sent, and takes no new work', async () => {
    const sent: OutgoingMail[] = [];
    let relayStarted!: () => void;
    const relayBusy = new Promise<void>((resolve) => (relayStarted = resolve));
    const runtime = createRuntime({
      env: parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent', UPLOADS_DIR: '/tmp' }),
      databaseUrl: database.url,
      logger: pino({ level: 'silent' }),
      // A relay that takes its time over each message.
      mailer: {
        send: async (mail) => {
          relayStarted();
          await new Promise((resolve) => setTimeout(resolve, 1200));
          sent.push(mail);
        },
      },
      baseUrl: TEST_ORIGIN,
      clientDir: '/nonexistent',
    });
    // A request that takes a while, as an upload or an analysis would.
    let slowArrived!: () => void;
    const slowStarted = new Promise<void>((resolve) => (slowArrived = resolve));
    runtime.app.get('/slow', (_req, res) => {
      slowArrived();
      setTimeout(() => res.json({ finished: true }), 1000);
    });
    const server = runtime.app.listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    const port = (server.address() as AddressInfo).port;
    const get = (path: string) =>
      new Promise<{ status: number; body: string; connection?: string }>((resolve, reject) => {
        http
          .get({ host: '127.0.0.1', port, path }, (res) => {
            let body = '';
            res.on('data', (c) => (body += c));
            res.on('end', () =>
              resolve({ status: res.statusCode!, body, connection: res.headers.connection }),
            );
          })
          .on('error', reject);
      });

    const mailId = await runtime.mail.enqueue(
      runtime.db,
      { to: 'late@quarrel-lane.example', subject: 'Results notice', text: 'x', html: '' },
      { kind: 'publish_notice' },
    );
    await relayBusy;
    const inFlight = get('/slow');
    await slowStarted;

    let finished = false;
    const stopping = runtime.shutdown(server, 5000).then(() => (finished = true));
    expect(runtime.deps.lifecycle.draining).toBe(true);
    // No new connections are taken.
    await expect(get('/api/ready')).rejects.toMatchObject({ code: 'ECONNREFUSED' });

    const slow = await inFlight;
    expect(slow.status).toBe(200);
    expect(JSON.parse(slow.body)).toEqual({ finished: true });
    expect(slow.connection).toBe('close');
    await stopping;
    expect(finished).toBe(true);
    // The message the relay was taking when the signal came was finished and recorded.
    expect(sent.map((m) => m.to)).toEqual(['late@quarrel-lane.example']);
    const row = await database.db
      .selectFrom('outgoing_mail')
      .select(['status', 'body'])
      .where('id', '=', mailId)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ status: 'sent', body: null });
  }, 30_000);

  it('answers 503 from /api/ready while draining', async () => {
    const runtime = createRuntime({
      env: parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent', UPLOADS_DIR: '/tmp' }),
      databaseUrl: database.url,
      logger: pino({ level: 'silent' }),
      mailer: { send: async () => {} },
      baseUrl: TEST_ORIGIN,
      clientDir: '/nonexistent',
      mailWorker: false,
    });
    try {
      runtime.deps.lifecycle.draining = true;
      const res = await request(runtime.app).get('/api/ready');
      expect(res.status).toBe(503);
      expect(res.body.status).toBe('shutting_down');
      expect(res.headers.connection).toBe('close');
    } finally {
      await runtime.close();
    }
  });
});

/**
 * The development mailbox lists every message the server sent, links included (a password
 * reset link is a way into the account), so only someone at this computer may read it: judged
 * by the connection's own address, never by a header the caller writes.
 */
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { mailboxBanner } from '../../server/mail/mailbox-router';
import { createTestApp, TEST_ORIGIN, type TestApp } from '../support/test-app';

let t: TestApp;
let clientDir: string;

/** An address of this machine that is not loopback (a connection to it does not come from 127.x). */
const outsideAddress = Object.values(os.networkInterfaces())
  .flat()
  .find((i) => i && i.family === 'IPv4' && !i.internal)?.address;

beforeAll(async () => {
  clientDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-shell-'));
  fs.writeFileSync(
    path.join(clientDir, 'index.html'),
    '<!doctype html><html><head><title>Rowtally</title></head><body></body></html>',
  );
  t = await createTestApp({ clientDir });
  // One message with a link in it, as a reset or an invitation would carry.
  await t.runtime.mail.enqueue(
    t.db,
    {
      to: 'owner@larkhaven.example',
      subject: 'Reset your Rowtally password',
      text: 'Choose a new password: http://127.0.0.1:3999/reset-password?token=secret-reset-token',
      html: '',
    },
    { kind: 'password_reset' },
  );
  await t.mailbox.waitFor((m) => m.to.includes('owner@larkhaven.example'));
});
afterAll(async () => {
  await t.close();
  fs.rmSync(clientDir, { recursive: true, force: true });
});

describe('the development mailbox', () => {
  it('shows the messages to a caller on this computer', async () => {
    const res = await request(t.app).get('/api/dev/mailbox');
    expect(res.status).toBe(200);
    expect(res.body.messages[0].subject).toBe('Reset your Rowtally password');
    expect((await request(t.app).get('/dev/mailbox')).status).toBe(200);
  });

  it('refuses a request a proxy forwarded, even over loopback', async () => {
    for (const [header, value] of [
      ['X-Forwarded-For', '203.0.113.9'],
      ['X-Forwarded-For', '127.0.0.1'],
      ['Forwarded', 'for=203.0.113.9'],
      ['X-Real-IP', '203.0.113.9'],
    ] as const) {
      const res = await request(t.app).get('/api/dev/mailbox').set(header, value);
      expect(res.status, `${header}: ${value}`).toBe(404);
      expect(res.text).not.toContain('secret-reset-token');
      expect((await request(t.app).get('/dev/mailbox').set(header, value)).status).toBe(404);
    }
    const cleared = await request(t.app)
      .delete('/api/dev/mailbox')
      .set('Origin', TEST_ORIGIN)
      .set('X-Forwarded-For', '203.0.113.9');
    expect(cleared.status).toBe(404);
    expect(t.mailbox.messages()).not.toEqual([]);
  });

  it.skipIf(!outsideAddress)(
    'answers 404 to a caller from another machine, whatever headers it sends',
    async () => {
      const server = t.app.listen(0, '0.0.0.0');
      await new Promise((resolve) => server.once('listening', resolve));
      try {
        const base = `http://${outsideAddress}:${(server.address() as AddressInfo).port}`;
        for (const headers of [{}, { 'X-Forwarded-For': '127.0.0.1' }] as Record<
          string,
          string
        >[]) {
          const api = await fetch(`${base}/api/dev/mailbox`, { headers });
          expect(api.status).toBe(404);
          expect(await api.text()).not.toContain('secret-reset-token');
          expect((await fetch(`${base}/dev/mailbox`, { headers })).status).toBe(404);
        }
        // The rest of the app answers that caller as usual.
        expect((await fetch(`${base}/api/health`)).status).toBe(200);
      } finally {
        await new Promise((resolve) => server.close(resolve));
      }
    },
  );

  it('is not there when mail goes elsewhere, or in production', async () => {
    const { deps } = t.runtime;
    for (const env of [
      { ...deps.env, SMTP_PORT: deps.mailbox!.port + 1 },
      { ...deps.env, SMTP_HOST: 'mail.larkhaven.example' },
      { ...deps.env, NODE_ENV: 'production' as const },
    ]) {
      const app = createApp({ ...deps, env });
      expect((await request(app).get('/api/dev/mailbox')).status).toBe(404);
      expect((await request(app).get('/dev/mailbox')).status).toBe(404);
    }
  });

  it('is announced at start as a development mailbox, for this computer only', () => {
    const banner = mailboxBanner('http://127.0.0.1:3000', 2525);
    expect(banner).toMatch(/^Development mailbox: mail is not delivered\./);
    expect(banner).toContain('http://127.0.0.1:3000/dev/mailbox from this computer only');
    expect(banner).toContain('127.0.0.1:2525');
  });
});

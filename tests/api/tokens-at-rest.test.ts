/**
 * What the account tables keep of the tokens that open an account. Digests are recomputed here
 * with Node's own SHA-256 (FIPS 180-4) and HMAC (RFC 2104), independent of the sign-in library.
 */
import crypto from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, createUser, TEST_ORIGIN, type TestApp } from '../support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

let ip = 0;
const post = (path: string) =>
  request(t.app).post(path).set('Origin', TEST_ORIGIN).set('X-Forwarded-For', `10.66.0.${++ip}`);
/** Every value of every row of a table, as text, to search for a token anywhere in it. */
const tableText = async (table: 'verifications' | 'sessions') =>
  JSON.stringify(await t.db.selectFrom(table).selectAll().execute());

describe('tokens at rest', () => {
  it('keeps only a SHA-256 digest of a password-reset link, and the link still works', async () => {
    const user = await createUser(t.db, { email: 'forgetful@larkhaven.example' });
    expect(
      (
        await post('/api/auth/request-password-reset').send({
          email: user.email,
          redirectTo: '/reset-password',
        })
      ).status,
    ).toBe(200);
    const mail = await t.mailbox.waitFor((m) => m.to.includes(user.email));
    const link = mail.links.find((l) => l.includes('/api/auth/reset-password/'))!;
    const token = new URL(link).pathname.split('/').pop()!;
    expect(token.length).toBeGreaterThanOrEqual(20);

    const stored = await tableText('verifications');
    expect(stored).not.toContain(token);
    const digest = crypto
      .createHash('sha256')
      .update(`reset-password:${token}`)
      .digest('base64url');
    const rows = await t.db
      .selectFrom('verifications')
      .select(['identifier', 'value'])
      .where('identifier', '=', digest)
      .execute();
    expect(rows).toEqual([{ identifier: digest, value: user.id }]);

    const reset = await post('/api/auth/reset-password').send({
      token,
      newPassword: 'a-brand-new-password',
    });
    expect(reset.status).toBe(200);
    expect(
      (
        await post('/api/auth/sign-in/email').send({
          email: user.email,
          password: 'a-brand-new-password',
        })
      ).status,
    ).toBe(200);
  });

  it('stores nothing of an e-mail confirmation link (a signed, expiring token)', async () => {
    const email = 'newcomer@larkhaven.example';
    await post('/api/auth/sign-up/email').send({
      name: 'Iris Coldbrook',
      email,
      password: 'pods-and-petals-2026',
    });
    const mail = await t.mailbox.waitFor((m) => m.to.includes(email) && /Confirm/.test(m.subject));
    const link = mail.links.find((l) => l.includes('/api/auth/verify-email'))!;
    const token = new URL(link).searchParams.get('token')!;
    expect(await tableText('verifications')).not.toContain(token);
    expect(await tableText('sessions')).not.toContain(token);
  });

  it('lets a stored session token in only when signed with the server secret, which the database does not hold', async () => {
    const user = await createUser(t.db);
    const signIn = await post('/api/auth/sign-in/email').send({
      email: user.email,
      password: user.password,
    });
    expect(signIn.status).toBe(200);
    const { token } = await t.db
      .selectFrom('sessions')
      .select('token')
      .where('user_id', '=', user.id)
      .executeTakeFirstOrThrow();
    const sign = (secret: string) =>
      encodeURIComponent(
        `${token}.${crypto.createHmac('sha256', secret).update(token).digest('base64')}`,
      );
    const me = (cookieValue: string) =>
      request(t.app).get('/api/me').set('Cookie', `rowtally.session_token=${cookieValue}`);
    // A token read from a dump, alone or signed with a guessed secret, opens nothing...
    expect((await me(token)).status).toBe(401);
    expect((await me(sign('a-guessed-secret-that-is-long-enough-0000'))).status).toBe(401);
    // ...while the same token signed with the server's secret does: the secret is the key.
    expect((await me(sign('test-secret-not-for-use-anywhere-else-0123456789'))).status).toBe(200);
    const secrets = JSON.stringify(await t.db.selectFrom('users').selectAll().execute());
    expect(secrets).not.toContain('test-secret-not-for-use-anywhere-else');
  });
});

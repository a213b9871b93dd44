/**
 * Accounts end to end over HTTP: the real app, the real sign-in library, real PostgreSQL and a
 * real SMTP capture server that the verification and reset links are read from.
 */
import crypto from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createTestApp,
  createUser,
  signedInAgent,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

let ipCounter = 0;
/** Each test speaks from its own address so the sign-in rate limits do not cross tests. */
const freshIp = () => `10.77.${Math.floor(++ipCounter / 250)}.${(ipCounter % 250) + 1}`;
const post = (path: string, ip = freshIp()) =>
  request(t.app).post(path).set('Origin', TEST_ORIGIN).set('X-Forwarded-For', ip);
const uniqueEmail = (label: string) => `${label}-${crypto.randomUUID().slice(0, 8)}@test.example`;
const pathOf = (url: string) => {
  const u = new URL(url);
  return u.pathname + u.search;
};
const countUsers = async (email: string) =>
  Number(
    (
      await t.db
        .selectFrom('users')
        .select((eb) => eb.fn.countAll().as('n'))
        .where('email', '=', email)
        .executeTakeFirstOrThrow()
    ).n,
  );

describe('sign-up and e-mail verification', () => {
  it('signs up, mails a confirmation link, and the link confirms the address and signs in', async () => {
    const email = uniqueEmail('newgrower');
    const res = await post('/api/auth/sign-up/email').send({
      name: 'Odile Fernsby',
      email,
      password: 'pods-and-petals-2026',
      callbackURL: '/email-verified',
    });
    expect(res.status).toBe(200);
    // requireEmailVerification: no session before the address is confirmed.
    expect(res.headers['set-cookie'] ?? []).toEqual([]);

    const signIn = await post('/api/auth/sign-in/email').send({
      email,
      password: 'pods-and-petals-2026',
    });
    expect(signIn.status).toBe(403);
    expect(signIn.body.code).toBe('EMAIL_NOT_VERIFIED');

    const mail = await t.mailbox.waitFor((m) => m.to.includes(email) && /Confirm/.test(m.subject));
    expect(mail.subject).toBe('Confirm your e-mail address for Rowtally');
    expect(mail.text).toContain('Rowtally');
    expect(mail.html).toContain('Rowtally');
    // No tracking: no images and no remote resources in the HTML body.
    expect(mail.html).not.toMatch(/<img|url\(/i);
    const link = mail.links.find((l) => l.includes('/api/auth/verify-email'))!;
    expect(link.startsWith(TEST_ORIGIN)).toBe(true);

    const verify = await request(t.app).get(pathOf(link));
    expect(verify.status).toBe(302);
    expect(verify.headers.location).toBe('/email-verified');
    const cookie = (verify.headers['set-cookie'] as unknown as string[])
      .find((c) => c.startsWith('rowtally.session_token='))!
      .split(';')[0]!;
    const me = await request(t.app).get('/api/me').set('Cookie', cookie);
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({
      email,
      name: 'Odile Fernsby',
      emailVerified: true,
      unitSystem: 'metric',
      isAdmin: false,
    });
  });

  it('sends a fresh confirmation link when an unconfirmed account signs in with the right password', async () => {
    const email = uniqueEmail('late');
    await post('/api/auth/sign-up/email').send({
      name: 'Late Confirmer',
      email,
      password: 'slow-to-open-mail',
    });
    await t.mailbox.waitFor((m) => m.to.includes(email));
    const before = t.mailbox.messages().filter((m) => m.to.includes(email)).length;
    const res = await post('/api/auth/sign-in/email').send({
      email,
      password: 'slow-to-open-mail',
    });
    expect(res.status).toBe(403);
    await expect
      .poll(() => t.mailbox.messages().filter((m) => m.to.includes(email)).length)
      .toBe(before + 1);
  });

  it('answers a taken address like a new one, creates nothing, and tells the owner by mail', async () => {
    const owner = await createUser(t.db, { email: uniqueEmail('owner'), name: 'Wren Owner' });
    const res = await post('/api/auth/sign-up/email').send({
      name: 'Someone Else',
      email: owner.email,
      password: 'a-different-password',
    });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(owner.email);
    expect(await countUsers(owner.email)).toBe(1);
    const mail = await t.mailbox.waitFor((m) => m.to.includes(owner.email));
    expect(mail.subject).toBe('Someone tried to sign up to Rowtally with your address');
    // The owner's password is untouched.
    expect(
      (await post('/api/auth/sign-in/email').send({ email: owner.email, password: owner.password }))
        .status,
    ).toBe(200);
    expect(
      (
        await post('/api/auth/sign-in/email').send({
          email: owner.email,
          password: 'a-different-password',
        })
      ).status,
    ).toBe(401);
  });

  it.each([
    ['an over-long name', { name: 'N'.repeat(121) }, 'name', 'Use at most 120 characters.'],
    ['an empty name', { name: '   ' }, 'name', 'Enter your name.'],
    [
      'a malformed address',
      { email: 'not-an-address' },
      'email',
      'Enter a valid e-mail address, like name@example.org.',
    ],
    [
      'an over-long address',
      { email: `${'a'.repeat(250)}@x.example` },
      'email',
      'Use at most 254 characters.',
    ],
    ['a short password', { password: 'short' }, 'password', 'Use at least 10 characters.'],
    [
      'an over-long password',
      { password: 'p'.repeat(129) },
      'password',
      'Use at most 128 characters.',
    ],
  ])(
    'refuses %s with a field message and creates nothing',
    async (_label, change, field, message) => {
      const email = uniqueEmail('bad');
      const body = { name: 'Valid Name', email, password: 'long-enough-password', ...change };
      const res = await post('/api/auth/sign-up/email').send(body);
      expect(res.status).toBe(400);
      expect(res.body.code).toBe('VALIDATION_FAILED');
      expect(res.body.fields).toContainEqual({ path: field, message });
      expect(await countUsers(email)).toBe(0);
      expect(await countUsers(String(body.email).toLowerCase())).toBe(0);
    },
  );
});

describe('sign-in', () => {
  it('stores the session in PostgreSQL behind an httpOnly, SameSite=Lax cookie', async () => {
    const user = await createUser(t.db);
    const res = await post('/api/auth/sign-in/email').send({
      email: user.email,
      password: user.password,
    });
    expect(res.status).toBe(200);
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) =>
      c.startsWith('rowtally.session_token='),
    )!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    // Served over http here; the Secure flag is only set behind https.
    expect(cookie).not.toMatch(/Secure/i);
    const sessions = await t.db
      .selectFrom('sessions')
      .select('id')
      .where('user_id', '=', user.id)
      .execute();
    expect(sessions).toHaveLength(1);
  });

  it('sets Secure cookies when the app is reached over https', async () => {
    const { createAuth } = await import('../../server/auth/auth');
    const { parseEnv } = await import('../../server/env');
    const pino = (await import('pino')).default;
    const auth = createAuth({
      pool: t.database.pool,
      db: t.db,
      env: parseEnv({ NODE_ENV: 'test' }),
      logger: pino({ level: 'silent' }),
      mail: { enqueue: async () => '', stop: async () => {} },
      baseUrl: 'https://trials.example',
      secret: 'x'.repeat(40),
    });
    const user = await createUser(t.db);
    const { headers } = await auth.api.signInEmail({
      body: { email: user.email, password: user.password },
      returnHeaders: true,
    });
    const cookie = headers.getSetCookie().find((c) => c.includes('session_token='))!;
    expect(cookie).toMatch(/^__Secure-rowtally\.session_token=/);
    expect(cookie).toMatch(/; Secure/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
  });

  it('gives one generic answer for a wrong password and for an unknown address', async () => {
    const user = await createUser(t.db);
    const wrong = await post('/api/auth/sign-in/email').send({
      email: user.email,
      password: 'not-the-password',
    });
    const unknown = await post('/api/auth/sign-in/email').send({
      email: uniqueEmail('nobody'),
      password: 'not-the-password',
    });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.message).toBe('Invalid email or password');
  });

  it('limits sign-in attempts from one address: the 11th within a minute is refused', async () => {
    // Ten different accounts, so the per-account delay (sign-in-throttle.test.ts) stays out of it.
    const users = await Promise.all(Array.from({ length: 11 }, () => createUser(t.db)));
    const ip = freshIp();
    const statuses: number[] = [];
    for (const user of users)
      statuses.push(
        (
          await post('/api/auth/sign-in/email', ip).send({
            email: user.email,
            password: 'wrong-password!',
          })
        ).status,
      );
    // Our own rule in server/auth/auth.ts: 10 sign-ins per 60 s.
    expect(statuses.slice(0, 10)).toEqual(Array(10).fill(401));
    expect(statuses[10]).toBe(429);
    // Another address is not held up.
    expect(
      (
        await post('/api/auth/sign-in/email').send({
          email: users[0]!.email,
          password: users[0]!.password,
        })
      ).status,
    ).toBe(200);
  });

  it('limits sign-ups and reset requests too (5 per minute from one address)', async () => {
    const ip = freshIp();
    const signUps: number[] = [];
    for (let i = 0; i < 6; i++)
      signUps.push(
        (
          await post('/api/auth/sign-up/email', ip).send({
            name: 'Flood',
            email: uniqueEmail('flood'),
            password: 'flood-password-1',
          })
        ).status,
      );
    expect(signUps).toEqual([200, 200, 200, 200, 200, 429]);
    const ip2 = freshIp();
    const resets: number[] = [];
    for (let i = 0; i < 6; i++)
      resets.push(
        (
          await post('/api/auth/request-password-reset', ip2).send({
            email: uniqueEmail('r'),
            redirectTo: '/reset-password',
          })
        ).status,
      );
    expect(resets).toEqual([200, 200, 200, 200, 200, 429]);
  });

  it('hashes passwords with scrypt (N=16384, r=16, p=1, 64-byte key) as RFC 7914 defines it', async () => {
    const user = await createUser(t.db, { email: uniqueEmail('hash') });
    // Sign up through the library so its own hashing is what we check.
    const email = uniqueEmail('hashed');
    await post('/api/auth/sign-up/email').send({
      name: 'Hash Check',
      email,
      password: 'pepper-and-salt-99',
    });
    const row = await t.db
      .selectFrom('accounts')
      .innerJoin('users', 'users.id', 'accounts.user_id')
      .select('accounts.password')
      .where('users.email', '=', email)
      .executeTakeFirstOrThrow();
    const [salt, key] = row.password!.split(':');
    expect(salt).toMatch(/^[0-9a-f]{32}$/);
    // Recomputed with Node's own scrypt (an implementation of RFC 7914), independent of the library.
    const expected = crypto
      .scryptSync('pepper-and-salt-99'.normalize('NFKC'), salt!, 64, {
        N: 16384,
        r: 16,
        p: 1,
        maxmem: 64 * 1024 * 1024,
      })
      .toString('hex');
    expect(key).toBe(expected);
    expect(user.id).toBeTruthy();
  });
});

describe('forgotten password', () => {
  it('mails a one-hour link that sets a new password and signs out every device', async () => {
    const user = await createUser(t.db, { email: uniqueEmail('forgetful') });
    const agent = await signedInAgent(t, user);
    expect((await agent.get('/api/me')).status).toBe(200);

    const res = await post('/api/auth/request-password-reset').send({
      email: user.email,
      redirectTo: '/reset-password',
    });
    expect(res.status).toBe(200);
    const mail = await t.mailbox.waitFor(
      (m) => m.to.includes(user.email) && /Reset/.test(m.subject),
    );
    expect(mail.text).toContain('one hour');
    const link = mail.links.find((l) => l.includes('/api/auth/reset-password/'))!;
    const opened = await request(t.app).get(pathOf(link));
    expect(opened.status).toBe(302);
    const location = new URL(String(opened.headers.location), TEST_ORIGIN);
    expect(location.pathname).toBe('/reset-password');
    const token = location.searchParams.get('token')!;
    expect(token).toBeTruthy();

    const reset = await post('/api/auth/reset-password').send({
      token,
      newPassword: 'a-brand-new-password',
    });
    expect(reset.status).toBe(200);
    expect((await agent.get('/api/me')).status).toBe(401);
    expect(
      (await post('/api/auth/sign-in/email').send({ email: user.email, password: user.password }))
        .status,
    ).toBe(401);
    expect(
      (
        await post('/api/auth/sign-in/email').send({
          email: user.email,
          password: 'a-brand-new-password',
        })
      ).status,
    ).toBe(200);
    // The link works once.
    expect(
      (await post('/api/auth/reset-password').send({ token, newPassword: 'yet-another-password' }))
        .status,
    ).toBe(400);
  });

  it('answers the same for an unknown address and sends nothing', async () => {
    const email = uniqueEmail('ghost');
    const res = await post('/api/auth/request-password-reset').send({
      email,
      redirectTo: '/reset-password',
    });
    expect(res.status).toBe(200);
    await new Promise((r) => setTimeout(r, 100));
    await t.mailSettled();
    expect(t.mailbox.messages().filter((m) => m.to.includes(email))).toEqual([]);
  });
});

describe('password change and signing out', () => {
  it('changes the password with the current one and can sign out the other devices', async () => {
    const user = await createUser(t.db);
    const phone = await signedInAgent(t, user);
    const laptop = await signedInAgent(t, user);
    const wrong = await phone.post('/api/auth/change-password').set('Origin', TEST_ORIGIN).send({
      currentPassword: 'not-it-at-all',
      newPassword: 'new-password-123',
      revokeOtherSessions: true,
    });
    expect(wrong.status).toBe(400);
    const ok = await phone.post('/api/auth/change-password').set('Origin', TEST_ORIGIN).send({
      currentPassword: user.password,
      newPassword: 'new-password-123',
      revokeOtherSessions: true,
    });
    expect(ok.status).toBe(200);
    expect((await laptop.get('/api/me')).status).toBe(401);
    expect((await phone.get('/api/me')).status).toBe(200);
  });

  it('signs out this device, or every device', async () => {
    const user = await createUser(t.db);
    const a = await signedInAgent(t, user);
    const b = await signedInAgent(t, user);
    const c = await signedInAgent(t, user);
    expect((await a.post('/api/auth/sign-out').set('Origin', TEST_ORIGIN)).status).toBe(200);
    expect((await a.get('/api/me')).status).toBe(401);
    expect((await b.get('/api/me')).status).toBe(200);
    expect((await b.post('/api/auth/revoke-sessions').set('Origin', TEST_ORIGIN)).status).toBe(200);
    expect((await b.get('/api/me')).status).toBe(401);
    expect((await c.get('/api/me')).status).toBe(401);
    const left = await t.db
      .selectFrom('sessions')
      .select('id')
      .where('user_id', '=', user.id)
      .execute();
    expect(left).toEqual([]);
  });
});

describe('requests from another site', () => {
  it('refuses a cross-site sign-in post that carries a cookie', async () => {
    const user = await createUser(t.db);
    const agent = await signedInAgent(t, user);
    const res = await agent.post('/api/auth/sign-out').set('Origin', 'https://elsewhere.example');
    expect(res.status).toBe(403);
    expect((await agent.get('/api/me')).status).toBe(200);
  });

  it('refuses a cross-site form post to our API and changes nothing', async () => {
    const user = await createUser(t.db, { name: 'Steady Name' });
    const agent = await signedInAgent(t, user);
    const res = await agent
      .patch('/api/me')
      .set('Origin', 'https://elsewhere.example')
      .set('Sec-Fetch-Site', 'cross-site')
      .type('form')
      .send({ name: 'Changed By Someone Else' });
    expect(res.status).toBe(403);
    expect(res.body.error).toMatchObject({
      code: 'forbidden',
      details: { reason: 'cross_origin' },
    });
    const me = await agent.get('/api/me');
    expect(me.body.name).toBe('Steady Name');
  });

  it('refuses a cross-site sign-up form post (no cookie) and creates nothing', async () => {
    const email = uniqueEmail('csrf');
    const res = await request(t.app)
      .post('/api/auth/sign-up/email')
      .set('Origin', 'https://elsewhere.example')
      .set('Sec-Fetch-Site', 'cross-site')
      .set('Sec-Fetch-Mode', 'navigate')
      .set('Sec-Fetch-Dest', 'document')
      .set('X-Forwarded-For', freshIp())
      .type('form')
      .send({ name: 'Forged', email, password: 'forged-password-1' });
    expect(res.status).toBe(403);
    expect(await countUsers(email)).toBe(0);
  });
});

describe('account settings', () => {
  it('keeps name and units preference, and refuses an over-long name with the field', async () => {
    const user = await createUser(t.db);
    const agent = await signedInAgent(t, user);
    const ok = await agent
      .patch('/api/me')
      .set('Origin', TEST_ORIGIN)
      .send({ name: 'Ines Marrowby', unitSystem: 'us' });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ name: 'Ines Marrowby', unitSystem: 'us' });
    const bad = await agent
      .patch('/api/me')
      .set('Origin', TEST_ORIGIN)
      .send({ name: 'x'.repeat(121), unitSystem: 'metric' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.fields).toContainEqual({
      path: 'body.name',
      message: 'Use at most 120 characters.',
    });
    expect((await agent.get('/api/me')).body).toMatchObject({
      name: 'Ines Marrowby',
      unitSystem: 'us',
    });
  });

  it('refuses an over-long name through the library’s own update route too', async () => {
    const user = await createUser(t.db, { name: 'Kept Name' });
    const agent = await signedInAgent(t, user);
    const res = await agent
      .post('/api/auth/update-user')
      .set('Origin', TEST_ORIGIN)
      .send({ name: 'y'.repeat(200) });
    expect(res.status).toBe(400);
    expect((await agent.get('/api/me')).body.name).toBe('Kept Name');
  });
});

/**
 * Sign-in throttling per account: wrong passwords for one account from many addresses earn a
 * growing wait (429 with Retry-After), never a lockout; the right password after the wait
 * signs in. Delays that grow instead of locking accounts: NIST SP 800-63B, section 5.2.2
 * (rate limiting); the numbers themselves are common practice (no source).
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { delayAfterFailures, signInThrottle } from '../../server/auth/sign-in-throttle';
import { createTestApp, createUser, TEST_ORIGIN, type TestApp } from '../support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

let ipCounter = 0;
/** Every attempt from an address of its own, so the per-address limit never answers. */
const signIn = (email: string, password: string) => {
  const n = ++ipCounter;
  return request(t.app)
    .post('/api/auth/sign-in/email')
    .set('Origin', TEST_ORIGIN)
    .set('X-Forwarded-For', `10.88.${Math.floor(n / 250)}.${(n % 250) + 1}`)
    .send({ email, password });
};
/** The wait runs out (the clock is moved, not waited for). */
const endTheWait = (email: string) =>
  t.db
    .updateTable('sign_in_throttles')
    .set({ blocked_until: new Date(Date.now() - 1000) })
    .where('email', '=', email.toLowerCase())
    .execute();

describe('sign-in throttling per account', () => {
  it('doubles the wait with each failure up to a ceiling, and is never a lockout', () => {
    const free = signInThrottle.freeFailures;
    expect(delayAfterFailures(free - 1)).toBe(0);
    expect(delayAfterFailures(free)).toBe(30);
    expect(delayAfterFailures(free + 1)).toBe(60);
    expect(delayAfterFailures(free + 2)).toBe(120);
    expect(delayAfterFailures(free + 20)).toBe(signInThrottle.maxDelaySeconds);
  });

  it('answers 429 with a growing Retry-After after a few failures from many addresses, then signs in with the right password after the wait', async () => {
    const user = await createUser(t.db);
    const statuses: number[] = [];
    for (let i = 0; i < 40; i++)
      statuses.push((await signIn(user.email, 'wrong-password!')).status);
    expect(statuses.slice(0, signInThrottle.freeFailures)).toEqual(
      Array(signInThrottle.freeFailures).fill(401),
    );
    expect(statuses.slice(signInThrottle.freeFailures)).toEqual(
      Array(40 - signInThrottle.freeFailures).fill(429),
    );

    // While the wait runs even the right password is not checked.
    const early = await signIn(user.email, user.password);
    expect(early.status).toBe(429);
    expect(early.body.code).toBe('SIGN_IN_DELAYED');
    const firstWait = Number(early.headers['retry-after']);
    expect(firstWait).toBeGreaterThan(20);
    expect(firstWait).toBeLessThanOrEqual(30);

    // One more wrong password after the wait: the next wait is twice as long.
    await endTheWait(user.email);
    expect((await signIn(user.email, 'wrong-again!!')).status).toBe(401);
    const second = await signIn(user.email, user.password);
    expect(second.status).toBe(429);
    const secondWait = Number(second.headers['retry-after']);
    expect(secondWait).toBeGreaterThan(firstWait);
    expect(secondWait).toBeLessThanOrEqual(60);

    // After the wait the owner signs in, and the count starts again.
    await endTheWait(user.email);
    const ok = await signIn(user.email.toUpperCase(), user.password);
    expect(ok.status).toBe(200);
    const left = await t.db
      .selectFrom('sign_in_throttles')
      .selectAll()
      .where('email', '=', user.email.toLowerCase())
      .execute();
    expect(left).toEqual([]);
    expect((await signIn(user.email, 'wrong-password!')).status).toBe(401);
  });

  it('counts attempts sent at once, so a burst gets no more than the free failures', async () => {
    const user = await createUser(t.db);
    const burst = await Promise.all(
      Array.from({ length: 15 }, () => signIn(user.email, 'wrong-password!')),
    );
    const statuses = burst.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 401)).toHaveLength(signInThrottle.freeFailures);
    expect(statuses.filter((s) => s === 429)).toHaveLength(15 - signInThrottle.freeFailures);
  });

  it('treats an address with no account exactly the same, so the answers reveal nothing', async () => {
    const known = await createUser(t.db);
    const unknown = 'nobody-here@test.example';
    const answers = async (email: string) => {
      const out: { status: number; code: unknown }[] = [];
      for (let i = 0; i < signInThrottle.freeFailures + 2; i++) {
        const r = await signIn(email, 'wrong-password!');
        out.push({ status: r.status, code: r.body.code });
      }
      return out;
    };
    expect(await answers(unknown)).toEqual(await answers(known.email));
  });

  it('holds up only the account under attack, not others', async () => {
    const target = await createUser(t.db);
    const bystander = await createUser(t.db);
    for (let i = 0; i <= signInThrottle.freeFailures; i++)
      await signIn(target.email, 'nope-nope-nope');
    expect((await signIn(target.email, target.password)).status).toBe(429);
    expect((await signIn(bystander.email, bystander.password)).status).toBe(200);
  });
});

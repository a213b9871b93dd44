/**
 * What anyone on the internet can do with a published sheet without an account: read its share
 * metadata and ask to follow it by e-mail. Neither may be turned against the sheet or a stranger.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { followLimits } from '../../server/results/results-service';
import { createTestApp, TEST_ORIGIN, type TestApp } from '../support/test-app';

let t: TestApp;
let clientDir: string;
let trialCount = 0;

beforeAll(async () => {
  clientDir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-shell-'));
  fs.writeFileSync(
    path.join(clientDir, 'index.html'),
    '<!doctype html><html><head><title>Rowtally</title></head><body><div id="root"></div></body></html>',
  );
  t = await createTestApp({ clientDir });
});
afterAll(async () => {
  await t.close();
  fs.rmSync(clientDir, { recursive: true, force: true });
});

async function publishedTrial(title = 'Fennick bush beans') {
  const slug = `sheet-${++trialCount}`;
  const trial = await t.db
    .insertInto('trials')
    .values({ slug, title, crop: 'Bush bean', season: '2026', design: 'crd', status: 'published' })
    .returning('id')
    .executeTakeFirstOrThrow();
  return { id: trial.id, slug };
}

const follow = (slug: string, email: string, ip = '198.51.100.7') =>
  request(t.app)
    .post(`/api/results/${slug}/followers`)
    .set('Origin', TEST_ORIGIN)
    .set('X-Forwarded-For', ip)
    .send({ email });

const confirmationsTo = (email: string) =>
  t.mailbox.messages().filter((m) => m.to.includes(email) && m.subject.startsWith('Confirm'));

/** Lets the mail that a request may have queued arrive before counting. */
const settle = () => t.mailSettled();

describe('the share metadata of a published sheet', () => {
  it('carries a title with $ signs as typed (no replacement patterns expanded)', async () => {
    // JavaScript's String.prototype.replace expands $&, $', $` and $$ in a replacement string
    // (ECMA-262, GetSubstitution); the title must come through literally.
    const title = "Cost $& yield: $' beans $` at $$5 $1";
    const { slug } = await publishedTrial(title);
    const res = await request(t.app).get(`/r/${slug}`);
    expect(res.status).toBe(200);
    const escaped = 'Cost $&amp; yield: $&#39; beans $` at $$5 $1 — results';
    expect(res.text).toContain(`<title>${escaped} · Rowtally</title>`);
    expect(res.text).toContain(`<meta property="og:title" content="${escaped}" />`);
    expect(res.text.match(/<title>/g)).toHaveLength(1);
    expect(res.text.match(/<html>/g)).toHaveLength(1);
    expect(res.text).toContain('<div id="root"></div></body></html>');
  });
});

describe('following a published sheet by e-mail', () => {
  it('sends one confirmation while one is pending, with the same answer every time', async () => {
    const { slug } = await publishedTrial();
    const email = 'pending@seed-swap.example';
    // At once, from several callers: the requests for one recipient are taken one at a time.
    const answers = await Promise.all(
      Array.from({ length: 6 }, (_, i) => follow(slug, email, `198.51.100.${20 + i}`)),
    );
    for (const a of answers) {
      expect(a.status).toBe(202);
      expect(a.body).toEqual(answers[0]!.body);
    }
    await settle();
    expect(confirmationsTo(email)).toHaveLength(1);
    // The first link still works: asking again did not replace it.
    const token = new URL(
      confirmationsTo(email)[0]!.links.find((l) => l.includes('/follow?token='))!,
    ).searchParams.get('token')!;
    const confirmed = await request(t.app)
      .post('/api/results/followers/confirm')
      .set('Origin', TEST_ORIGIN)
      .send({ token });
    expect(confirmed.status).toBe(200);
  });

  it('sends a new confirmation once the pending one is over an hour old', async () => {
    const { slug } = await publishedTrial();
    const email = 'later@seed-swap.example';
    expect((await follow(slug, email)).status).toBe(202);
    await t.db
      .updateTable('follow_requests')
      .set({ requested_at: new Date(Date.now() - followLimits.pendingConfirmationMs - 60_000) })
      .where('email', '=', email)
      .execute();
    expect((await follow(slug, email)).status).toBe(202);
    await settle();
    expect(confirmationsTo(email)).toHaveLength(2);
  });

  it('mails one address at most a few confirmations a day, across all sheets', async () => {
    const email = 'target@seed-swap.example';
    const limit = followLimits.confirmationsPerRecipientPerDay;
    for (let i = 0; i < limit + 3; i++) {
      const { slug } = await publishedTrial();
      const res = await follow(slug, email, `203.0.113.${i + 1}`);
      expect(res.status).toBe(202);
    }
    await settle();
    expect(confirmationsTo(email)).toHaveLength(limit);
  });

  it('limits requests from one caller address, saying when to try again', async () => {
    const { slug } = await publishedTrial();
    const ip = '192.0.2.77';
    const statuses: number[] = [];
    for (let i = 0; i < followLimits.requestsPerAddressPerHour + 1; i++)
      statuses.push((await follow(slug, `flood-${i}@seed-swap.example`, ip)).status);
    expect(statuses.slice(0, -1)).toEqual(Array(followLimits.requestsPerAddressPerHour).fill(202));
    const refused = await follow(slug, 'one-more@seed-swap.example', ip);
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe('rate_limited');
    const retryAfter = Number(refused.headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(3000);
    expect(retryAfter).toBeLessThanOrEqual(3600);
    await settle();
    expect(confirmationsTo('one-more@seed-swap.example')).toEqual([]);
    // Another caller is not held up.
    expect((await follow(slug, 'other-caller@seed-swap.example', '192.0.2.78')).status).toBe(202);
  });

  it('keeps the limits in PostgreSQL, so they hold for every app process', async () => {
    const { slug, id } = await publishedTrial();
    await follow(slug, 'kept@seed-swap.example', '192.0.2.90');
    const rows = await t.db
      .selectFrom('follow_requests')
      .select(['email', 'client_ip', 'mailed'])
      .where('trial_id', '=', id)
      .execute();
    expect(rows).toEqual([
      { email: 'kept@seed-swap.example', client_ip: '192.0.2.90', mailed: true },
    ]);
  });
});

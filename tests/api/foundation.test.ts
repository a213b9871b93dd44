import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

describe('GET /api/health', () => {
  it('reports the version and that the database answers', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      status: 'ok',
      version: '0.1.0',
      database: { reachable: true },
    });
    expect(typeof res.body.database.latencyMs).toBe('number');
  });

  it('says the database is unreachable with 503 when it is', async () => {
    const other = await createTestApp();
    await other.runtime.pool.end();
    const res = await request(other.app).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body.database.reachable).toBe(false);
    await other.database.drop();
    await other.mailbox.close();
  });
});

describe('the error shape', () => {
  it('answers an unknown API route with 404 and the error body', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({
      error: { code: 'not_found', message: 'No API route matches GET /api/no-such-thing.' },
    });
  });

  it('refuses a malformed trial address with per-field messages', async () => {
    const res = await request(t.app).get('/api/trials/Not_A_Slug!');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields).toEqual([
      { path: 'params.slug', message: 'Not a trial address.' },
    ]);
  });

  it('refuses a body that is not JSON with 400', async () => {
    const res = await request(t.app)
      .patch('/api/me')
      .set('Content-Type', 'application/json')
      .send('{"name":');
    expect(res.status).toBe(400);
    expect(res.body.error).toEqual({
      code: 'validation_failed',
      message: 'The request body is not valid JSON.',
    });
  });

  it('refuses an oversized body with 413 naming the limit', async () => {
    const res = await request(t.app)
      .patch('/api/me')
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ name: 'x'.repeat(1_100_000) }));
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(res.body.error.message).toContain('1048576');
  });

  it('tells a signed-out browser who is signed in without an error status', async () => {
    const res = await request(t.app).get('/api/session');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ user: null });
  });

  it('answers 401 to a signed-out request for the current user', async () => {
    const res = await request(t.app).get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error).toEqual({ code: 'unauthenticated', message: 'Sign in to do this.' });
  });

  it('hides an unpublished trial from someone outside it (404)', async () => {
    await t.db
      .insertInto('trials')
      .values({ slug: 'quiet-trial', title: 'Quiet', crop: 'Okra', season: '2026', design: 'crd' })
      .execute();
    const res = await request(t.app).get('/api/trials/quiet-trial');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('tells a grower which sites they record at, and everyone else null', async () => {
    const { createUser, mintSessionCookie } = await import('../support/test-app');
    const trial = await t.db
      .insertInto('trials')
      .values({
        slug: 'two-gardens',
        title: 'Two gardens',
        crop: 'Okra',
        season: '2026',
        design: 'multisite',
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const [north, south] = await Promise.all(
      ['North bed', 'South bed'].map(
        async (name) =>
          (
            await t.db
              .insertInto('sites')
              .values({ trial_id: trial.id, name })
              .returning('id')
              .executeTakeFirstOrThrow()
          ).id,
      ),
    );
    const grower = await createUser(t.db);
    const lead = await createUser(t.db);
    await t.db
      .insertInto('trial_members')
      .values([
        { trial_id: trial.id, user_id: grower.id, role: 'grower' },
        { trial_id: trial.id, user_id: lead.id, role: 'lead' },
      ])
      .execute();
    await t.db
      .insertInto('trial_member_sites')
      .values({ trial_id: trial.id, user_id: grower.id, site_id: south! })
      .execute();
    const asGrower = await request(t.app)
      .get('/api/trials/two-gardens')
      .set('Cookie', await mintSessionCookie(t, grower));
    expect(asGrower.body.mySiteIds).toEqual([south]);
    expect(asGrower.body.sites.map((s: { id: string }) => s.id).sort()).toEqual(
      [north, south].sort(),
    );
    const asLead = await request(t.app)
      .get('/api/trials/two-gardens')
      .set('Cookie', await mintSessionCookie(t, lead));
    expect(asLead.body.mySiteIds).toBeNull();
  });

  it('sets the usual security headers', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
  });
});

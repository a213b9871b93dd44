// The analysis routes under load and abuse: the engine runs off the request thread (the
// health check answers while a long analysis runs), sheets beyond the row, entry and time
// limits are refused with the limit named, and each account has a rate limit that every app
// process counts together (kept in PostgreSQL). Limits are our own choice (common practice,
// no source); the checks are of behaviour, not of figures from outside.
import pino from 'pino';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { setAnalysisTimeLimit } from '../../server/analysis/analysis-pool';
import { parseEnv } from '../../server/env';
import { createRuntime, type Runtime } from '../../server/runtime';
import { createTestApp, createUser, mintSessionCookie, type TestApp } from '../support/test-app';

const limitsEnv = { ANALYSIS_TIME_LIMIT_MS: '3000', ANALYSIS_RATE_PER_MINUTE: '6' };
let t: TestApp;
let lead: string;

beforeAll(async () => {
  t = await createTestApp({ env: limitsEnv });
  lead = await mintSessionCookie(t, await createUser(t.db, { name: 'Orla Fennick' }));
}, 60_000);
afterAll(async () => {
  await t.runtime.close();
  await t.close();
});

/** A sheet of `entries` varieties × `plots` plots each, one site, no blocks. */
function crdSheet(entries: number, plots: number): string {
  const lines = ['variety,yield_g'];
  for (let e = 0; e < entries; e++)
    for (let p = 0; p < plots; p++) lines.push(`Variety ${e},${100 + e + p * 3}`);
  return lines.join('\n');
}

/** Several sites and blocks with one plot missing: the least-squares path, slow with many entries. */
function unbalancedSheet(entries: number, sites: number): string {
  const lines = ['site,block,variety,yield_g'];
  for (let s = 0; s < sites; s++)
    for (let b = 0; b < 3; b++)
      for (let e = 0; e < entries; e++) {
        if (s === 0 && b === 0 && e === 0) continue;
        const y = e * 7 + s * 3 + b + ((e * 31 + b * 17 + s) % 13) / 10;
        lines.push(`S${s},B${b},V${e},${y.toFixed(1)}`);
      }
  return lines.join('\n');
}

const analyze = (csv: string, cookie = lead, query = '') =>
  request(t.app)
    .post(`/api/analyze${query}`)
    .set('Cookie', cookie)
    .set('Content-Type', 'text/csv')
    .send(csv);

describe('POST /api/analyze limits', () => {
  it('answers a small sheet (and starts the analysis threads)', async () => {
    const r = await analyze(crdSheet(3, 3));
    expect(r.status).toBe(200);
    expect(r.body.means).toHaveLength(3);
    expect(r.body.lettersOmitted).toBeNull();
  }, 30_000);

  it('refuses more rows than the limit with 413 naming it', async () => {
    const r = await analyze(crdSheet(50, 401)); // 20,050 rows
    expect(r.status).toBe(413);
    expect(r.body.error).toMatchObject({
      code: 'payload_too_large',
      message: 'The data has 20050 rows; the limit is 20000 rows per analysis.',
      details: { limit: 'rows', max: 20000, actual: 20050 },
    });
  });

  it('refuses more entries than the limit with 422 naming it', async () => {
    const r = await analyze(crdSheet(401, 2));
    expect(r.status).toBe(422);
    expect(r.body.error).toMatchObject({
      code: 'unprocessable',
      details: { limit: 'entries', max: 400, actual: 401 },
    });
    expect(r.body.error.message).toMatch(/limit is 400 entries/);
  });

  it('answers an alpha too extreme for the HSD critical value with 422, not a fault', async () => {
    const r = await analyze(crdSheet(50, 3), lead, '?alpha=0.000000000001');
    expect(r.status).toBe(422);
    expect(r.body.error.message).toMatch(/HSD critical value cannot be computed/);
  }, 30_000);

  it('answers the health check while a long analysis runs on its own thread', async () => {
    let analysedAt = 0;
    const pending = analyze(unbalancedSheet(400, 4)).then((r) => {
      analysedAt = performance.now();
      return r;
    });
    // Let the analysis request reach the server, then ask for health while it is being worked on.
    await new Promise((r) => setTimeout(r, 20));
    const health = await request(t.app).get('/api/health');
    const healthAt = performance.now();
    expect(health.status).toBe(200);
    await pending;
    expect(healthAt).toBeLessThan(analysedAt);
  }, 60_000);

  it('stops an analysis past the time limit (422)', async () => {
    // The lowest limit the environment accepts, so the heaviest allowed sheet always exceeds
    // it whatever the machine's speed.
    setAnalysisTimeLimit(50);
    try {
      const r = await analyze(unbalancedSheet(400, 4));
      expect(r.status).toBe(422);
      expect(r.body.error).toMatchObject({
        code: 'unprocessable',
        message: 'The analysis took longer than the time limit of 0.05 s and was stopped.',
        details: { limit: 'time', max: 50 },
      });
    } finally {
      setAnalysisTimeLimit(3000);
    }
  }, 60_000);
});

describe('the analysis rate limit, per account and shared by app processes', () => {
  let second: Runtime;
  beforeAll(() => {
    const env = parseEnv({ NODE_ENV: 'test', LOG_LEVEL: 'silent', ...limitsEnv });
    second = createRuntime({
      env,
      databaseUrl: t.database.url,
      logger: pino({ level: 'silent' }),
      mailer: { send: async () => {} },
      clientDir: '/nonexistent',
    });
  });
  afterAll(async () => {
    await second.mail.stop();
    await second.pool.end();
  });

  it('counts requests to either process against one limit and says when to retry', async () => {
    const grower = await mintSessionCookie(t, await createUser(t.db, { name: 'Ivo Brackwater' }));
    const other = await mintSessionCookie(t, await createUser(t.db, { name: 'Tamsin Reeve' }));
    const sheet = crdSheet(3, 2);
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) {
      const app = i % 2 === 0 ? t.app : second.app;
      statuses.push(
        (
          await request(app)
            .post('/api/analyze')
            .set('Cookie', grower)
            .set('Content-Type', 'text/csv')
            .send(sheet)
        ).status,
      );
    }
    expect(statuses).toEqual([200, 200, 200, 200, 200, 200]);
    const refused = await request(second.app)
      .post('/api/analyze')
      .set('Cookie', grower)
      .set('Content-Type', 'text/csv')
      .send(sheet);
    expect(refused.status).toBe(429);
    expect(refused.body.error).toMatchObject({
      code: 'rate_limited',
      details: { limit: 'analysis', max: 6, windowSeconds: 60 },
    });
    const retryAfter = Number(refused.headers['retry-after']);
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);
    // The trial routes share the limit.
    const trial = await request(t.app)
      .get('/api/trials/no-such-trial/analysis?trait=yield')
      .set('Cookie', grower);
    expect(trial.status).toBe(429);
    // Another account is not held back by it.
    expect((await analyze(sheet, other)).status).toBe(200);
  }, 60_000);
});

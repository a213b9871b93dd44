import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Design } from '../../common/contracts/design';
import { describePlan } from '../../common/incomplete-blocks';
import { randomizeLayout } from '../../common/layout';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';

let t: TestApp;
let cookie: string;

beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db, { name: 'Wenna Pollard', email: 'wenna@pollard.example' });
  cookie = await mintSessionCookie(t, lead);
});
afterAll(async () => {
  await t.close();
});

const send = (method: 'get' | 'post' | 'patch', url: string, body?: object) =>
  request(t.app)[method](url).set('Origin', TEST_ORIGIN).set('Cookie', cookie).send(body);

/** Twelve invented bean entries, codes B01 … B12. */
const entries = Array.from({ length: 12 }, (_, i) => ({
  code: `B${String(i + 1).padStart(2, '0')}`,
  name: `Marrowfield ${['Amber', 'Birch', 'Cinder', 'Dove', 'Elm', 'Fern', 'Gorse', 'Hazel', 'Iris', 'Juniper', 'Kale', 'Linden'][i]}`,
  entryType: 'heirloom',
  inRowSpacingMm: 150,
}));

async function trial(design: string, sites: number) {
  const created = await send('post', '/api/trials', {
    title: `Bean ${design} trial`,
    crop: 'Pole bean',
    season: '2027',
    design,
  });
  expect(created.status).toBe(201);
  const slug = created.body.slug as string;
  for (const e of entries)
    expect((await send('post', `/api/trials/${slug}/entries`, e)).status).toBe(201);
  for (let i = 1; i <= sites; i++)
    expect(
      (
        await send('post', `/api/trials/${slug}/sites`, {
          name: `Garden ${String(i).padStart(2, '0')}`,
        })
      ).status,
    ).toBe(201);
  return slug;
}

const design = async (slug: string) => {
  const res = await send('get', `/api/trials/${slug}/design`);
  expect(res.status).toBe(200);
  return res.body as Design;
};

const plotSize = { rowLengthMm: 3000, rowSpacingMm: 600 };

describe('incomplete blocks at one site', () => {
  it('lays out the plan the stored seed gives and reports how evenly entries meet', async () => {
    const slug = await trial('incomplete', 1);
    const res = await send('post', `/api/trials/${slug}/layout`, {
      replicates: 3,
      blockSize: 4,
      seed: 4242,
      ...plotSize,
    });
    expect(res.status).toBe(201);
    const d = await design(slug);
    expect(d.plots).toHaveLength(36);
    expect(d.layout).toMatchObject({ seed: 4242, replicates: 3, blockSize: 4 });
    // The stored plots are the pure plan for these entries and this seed.
    const planned = randomizeLayout({
      design: 'incomplete',
      entryIds: d.entries.map((e) => e.id),
      replicates: 3,
      blockSize: 4,
      siteIds: d.sites.map((s) => s.id),
      seed: 4242,
    });
    const key = (p: { block: number; position: number }) => p.block * 100 + p.position;
    const byKey = new Map(d.plots.map((p) => [key(p), p]));
    for (const p of planned) {
      expect(byKey.get(key(p))).toMatchObject({
        entryId: p.entryId,
        replicate: p.replicate,
        plotNumber: p.plotNumber,
      });
    }
    // 12 entries in blocks of 4: 3 blocks a replicate, so some pair must meet twice (see the
    // unit tests); the summary reads the stored plots.
    expect(d.layout.blocks).toMatchObject({
      blocks: 9,
      fullReplicates: 3,
      smallestBlock: 4,
      largestBlock: 4,
      concurrenceMin: 0,
      concurrenceMax: 2,
      replicationMin: 3,
      replicationMax: 3,
    });
    expect(d.layout.blocks).toEqual(
      describePlan(
        planned.map((p) => ({
          block: `${p.siteId}:${p.block}`,
          entry: p.entryId,
          replicate: p.replicate ?? null,
        })),
        d.entries.map((e) => e.id),
      ),
    );
  });

  it('refuses a missing or too large block size, and too few replicates, on the field', async () => {
    const slug = await trial('incomplete', 1);
    const url = `/api/trials/${slug}/layout`;
    for (const [body, path, message] of [
      [{ replicates: 3 }, 'body.blockSize', /each block holds/],
      [{ replicates: 3, blockSize: 12 }, 'body.blockSize', /from 2 to 11/],
      [{ replicates: 1, blockSize: 4 }, 'body.replicates', /at least 2 replicates/],
      [{ replicates: 40, blockSize: 4 }, 'body.replicates', /more than 99 blocks/],
    ] as const) {
      const res = await send('post', url, { ...body, ...plotSize });
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields[0]).toMatchObject({ path });
      expect(res.body.error.details.fields[0].message).toMatch(message);
    }
    expect((await design(slug)).plots).toHaveLength(0);
  });

  it('a complete-block design ignores a block size and keeps none', async () => {
    const slug = await trial('rcbd', 1);
    const res = await send('post', `/api/trials/${slug}/layout`, {
      replicates: 2,
      blockSize: 4,
      ...plotSize,
    });
    expect(res.status).toBe(201);
    const d = await design(slug);
    expect(d.plots).toHaveLength(24);
    expect(d.layout).toMatchObject({ blockSize: null, blocks: null });
    expect(d.plots.every((p) => p.replicate === null)).toBe(true);
  });
});

describe('a network where each volunteer grows k entries', () => {
  it('needs gardens for two replicates, then gives each garden one block of k entries', async () => {
    const slug = await trial('network', 5);
    const refused = await send('post', `/api/trials/${slug}/layout`, {
      replicates: 1,
      blockSize: 4,
      ...plotSize,
    });
    expect(refused.status).toBe(422);
    expect(refused.body.error.message).toMatch(/at least 6 \(the trial has 5\)/);

    for (let i = 6; i <= 20; i++)
      await send('post', `/api/trials/${slug}/sites`, {
        name: `Garden ${String(i).padStart(2, '0')}`,
      });
    const res = await send('post', `/api/trials/${slug}/layout`, {
      replicates: 1,
      blockSize: 4,
      seed: 77,
      ...plotSize,
    });
    expect(res.status).toBe(201);
    const d = await design(slug);
    expect(d.plots).toHaveLength(80);
    for (const site of d.sites) {
      const mine = d.plots.filter((p) => p.siteId === site.id);
      expect(mine.map((p) => p.plotNumber).sort()).toEqual([101, 102, 103, 104]);
    }
    // 20 gardens of 4: six full replicates of 3 gardens, two gardens more.
    expect(d.layout).toMatchObject({ replicates: 6, blockSize: 4 });
    expect(d.layout.blocks).toMatchObject({
      blocks: 20,
      fullReplicates: 6,
      smallestBlock: 4,
      largestBlock: 4,
      replicationMin: 6,
      replicationMax: 7,
      efficiency: null,
    });
    expect(d.layout.blocks!.concurrenceMax).toBeLessThanOrEqual(3);
  });
});

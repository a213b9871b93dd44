/**
 * The per-plot harvest totals the analysis reads are kept by the database on every change to
 * harvests. Their definition is the GROUP BY over the live harvest rows (what the analysis
 * summed before the totals were kept), and the decimals a mass needs are the app's own
 * decimalsOf (common/precision.ts): after every step of a seeded random sequence of writes —
 * through the API (new records, repeated sends from the offline outbox, edits, deletes, undo,
 * CSV imports) and straight in SQL (a harvest moved to another plot, hard deletes, one
 * statement changing rows of several plots, a plot or trial deleted) — the kept totals equal that
 * definition, row for row. Concurrent writers to one plot lose nothing.
 */
import pg from 'pg';
import { sql } from 'kysely';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decimalsOf } from '../../common/precision';
import { createRandom } from '../../common/random';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';
import { insertBlocksTrial, type SmallTrial, vigorScoreTrait } from '../support/trial-fixture';

let t: TestApp;
let trial: SmallTrial;
let cookie: string;
let leadId: string;
const slug = 'kept-totals-trial';
const siteName = 'Quarry Field';

beforeAll(async () => {
  t = await createTestApp();
  const lead = await createUser(t.db, { name: 'Maelis Porterfield' });
  leadId = lead.id;
  trial = await insertBlocksTrial(t.db, {
    trial: { slug, title: 'Kept totals', crop: 'squash' },
    siteName,
    entryNames: ['Amber Lantern', 'Drumlin Green', 'Saltmarsh Gold'],
    blocks: 2,
    trait: vigorScoreTrait,
    leadId: lead.id,
  });
  cookie = await mintSessionCookie(t, lead);
}, 60_000);
afterAll(async () => {
  await t.close();
});

interface TotalsRow {
  plot_id: string;
  harvests: number;
  fruit_count: number;
  marketable_fruit_count: number;
  /** numeric, as PostgreSQL writes it */
  mass_g: string;
  marketable_mass_g: string;
  harvest_days: number;
  first_harvested_on: string;
  last_harvested_on: string;
  mass_decimals: number;
}

/** What the database keeps for the trial, plot by plot. */
async function kept(trialId: string): Promise<TotalsRow[]> {
  const { rows } = await sql<TotalsRow>`
    select plot_id, harvests, fruit_count, marketable_fruit_count,
      mass_g::text, marketable_mass_g::text, harvest_days,
      first_harvested_on, last_harvested_on, mass_decimals
    from plot_harvest_totals where trial_id = ${trialId} order by plot_id`.execute(t.db);
  return rows;
}

/** The definition: the live harvest rows grouped by plot, the decimals by decimalsOf. */
async function fromRawRows(trialId: string): Promise<TotalsRow[]> {
  const { rows } = await sql<Omit<TotalsRow, 'mass_decimals'> & { masses: number[] }>`
    select plot_id, count(*)::int as harvests, sum(fruit_count) as fruit_count,
      coalesce(sum(fruit_count) filter (where grade = 'marketable'), 0) as marketable_fruit_count,
      sum(mass_g::numeric)::text as mass_g,
      coalesce(sum(mass_g::numeric) filter (where grade = 'marketable'), 0)::text as marketable_mass_g,
      count(distinct harvested_on)::int as harvest_days,
      min(harvested_on) as first_harvested_on, max(harvested_on) as last_harvested_on,
      array_agg(mass_g::float8) as masses
    from harvests where trial_id = ${trialId} and deleted_at is null
    group by plot_id order by plot_id`.execute(t.db);
  return rows.map(({ masses, ...r }) => ({
    ...r,
    mass_decimals: Math.max(...masses.map(decimalsOf)),
  }));
}

const post = (path: string, body: object) =>
  request(t.app).post(path).set('Origin', TEST_ORIGIN).set('Cookie', cookie).send(body);

describe('kept per-plot harvest totals', () => {
  it('equal the GROUP BY over the live harvests after every step of a random sequence of writes', async () => {
    const random = createRandom(20261203);
    const pick = <T>(xs: readonly T[]): T => xs[random.int(0, xs.length - 1)]!;
    const plotNumbers = Object.keys(trial.plotIds).map(Number);
    const days = ['2026-07-02', '2026-07-09', '2026-07-16', '2026-07-23', '2026-08-01'];
    // Masses needing 0, 1, 2, 3 and 6 decimals, so taking one away can lower the trial's.
    const masses = [250, 412.5, 0.1, 37.25, 1.125, 88.000001, 1942.6, 0, 15.05];
    const grades = ['marketable', 'cull'] as const;
    // Harvests posted through the API (for sending again) and deleted through it (for undo).
    const known = new Set<string>();
    const deletedHere = new Set<string>();
    const liveIds = async (deleted: boolean) =>
      (
        await t.db
          .selectFrom('harvests')
          .select(['id', 'version'])
          .where('trial_id', '=', trial.trialId)
          .where('deleted_at', deleted ? 'is not' : 'is', null)
          .orderBy('id')
          .execute()
      ).map((r) => ({ id: r.id, version: r.version }));
    // Ids from the seed too, so the records chosen below come in the same order every run
    // (those the database numbers itself, from imports and bulk loads, still vary).
    const hex = (n: number) =>
      Array.from({ length: n }, () => random.int(0, 15).toString(16)).join('');
    const newHarvest = () => ({
      id: `${hex(8)}-${hex(4)}-4${hex(3)}-a${hex(3)}-${hex(12)}`,
      plotNumber: pick(plotNumbers),
      harvestedOn: pick(days),
      fruitCount: random.int(0, 12),
      massG: pick(masses),
      grade: pick(grades),
    });
    const steps: Record<string, () => Promise<void>> = {
      async create() {
        const h = newHarvest();
        const res = await post(`/api/trials/${slug}/harvests`, {
          id: h.id,
          plotId: trial.plotIds[h.plotNumber],
          harvestedOn: h.harvestedOn,
          fruitCount: h.fruitCount,
          massG: h.massG,
          grade: h.grade,
          note: '',
        });
        expect(res.status).toBe(201);
        known.add(h.id);
      },
      // The outbox sends a record again when it never heard the answer: nothing changes.
      async resend() {
        if (known.size === 0) return;
        const sent = await t.db
          .selectFrom('harvests')
          .selectAll()
          .where('id', 'in', [...known])
          .orderBy('id')
          .execute();
        if (sent.length === 0) return;
        const row = pick(sent);
        const res = await post(`/api/trials/${slug}/harvests`, {
          id: row.id,
          plotId: row.plot_id,
          harvestedOn: row.harvested_on,
          fruitCount: row.fruit_count,
          massG: row.mass_g,
          grade: row.grade,
          note: row.note,
        });
        expect(res.status).toBe(200);
      },
      async edit() {
        const live = await liveIds(false);
        if (live.length === 0) return;
        const { id, version } = pick(live);
        const change: Record<string, unknown> = { version };
        if (random.int(0, 1)) change.harvestedOn = pick(days);
        if (random.int(0, 1)) change.fruitCount = random.int(0, 12);
        if (random.int(0, 1)) change.massG = pick(masses);
        if (random.int(0, 1)) change.grade = pick(grades);
        if (random.int(0, 3) === 0) change.note = 'Recounted at the shed.';
        const res = await request(t.app)
          .patch(`/api/trials/${slug}/harvests/${id}`)
          .set('Origin', TEST_ORIGIN)
          .set('Cookie', cookie)
          .send(change);
        expect(res.status).toBe(200);
      },
      async softDelete() {
        const live = await liveIds(false);
        if (live.length === 0) return;
        const { id } = pick(live);
        const res = await request(t.app)
          .delete(`/api/trials/${slug}/harvests/${id}`)
          .set('Origin', TEST_ORIGIN)
          .set('Cookie', cookie);
        expect(res.status).toBe(200);
        deletedHere.add(id);
      },
      // The grower's undo, open for what they deleted themselves.
      async undoDelete() {
        const mine = (await liveIds(true)).filter((r) => deletedHere.has(r.id));
        if (mine.length === 0) return;
        const { id } = pick(mine);
        const res = await post(`/api/trials/${slug}/harvests/${id}/undo-delete`, {});
        expect(res.status).toBe(200);
        deletedHere.delete(id);
      },
      // The lead's restore from the audit log, for any deleted record.
      async leadRestore() {
        const deleted = await liveIds(true);
        if (deleted.length === 0) return;
        const { id } = pick(deleted);
        const res = await post(`/api/trials/${slug}/audit/restore`, {
          table: 'harvests',
          recordId: id,
        });
        expect(res.status).toBe(200);
        deletedHere.delete(id);
      },
      async importCsv() {
        const rows = Array.from({ length: random.int(1, 5) }, newHarvest);
        const csv = [
          'site,plot_number,entry_code,harvested_on,fruit_count,mass_g,grade,note',
          ...rows.map(
            (h) =>
              `${siteName},${h.plotNumber},E${h.plotNumber % 100},${h.harvestedOn},${h.fruitCount},${h.massG},${h.grade},imported`,
          ),
        ].join('\n');
        const res = await post(`/api/trials/${slug}/records/import`, { kind: 'harvests', csv });
        expect(res.status).toBe(201);
      },
      // Not offered by the API, and the database must still keep both plots right.
      async moveToAnotherPlot() {
        const live = await liveIds(false);
        if (live.length === 0) return;
        await t.db
          .updateTable('harvests')
          .set({ plot_id: trial.plotIds[pick(plotNumbers)]! })
          .where('id', '=', pick(live).id)
          .execute();
      },
      async hardDelete() {
        const all = [...(await liveIds(false)), ...(await liveIds(true))];
        if (all.length === 0) return;
        await t.db.deleteFrom('harvests').where('id', '=', pick(all).id).execute();
      },
      // One statement changing rows of several plots: some deleted, others restored.
      async toggleMany() {
        // Not audited, so the grower's undo no longer applies to these rows.
        deletedHere.clear();
        await sql`
          update harvests
          set deleted_at = case when deleted_at is null then now() else null end
          where trial_id = ${trial.trialId} and (hashtext(id::text) % 3) = ${random.int(0, 2)}`.execute(
          t.db,
        );
      },
      // Many rows of every plot at once, as a bulk load writes them.
      async bulkInsert() {
        await sql`
          insert into harvests (trial_id, plot_id, harvested_on, fruit_count, mass_g, grade, created_by, updated_by)
          select p.trial_id, p.id, date '2026-07-02' + (k * 7 % 35), k % 4, 12.5 * k, 'marketable', ${leadId}, ${leadId}
          from plots p cross join generate_series(1, ${random.int(1, 4)}) as k
          where p.trial_id = ${trial.trialId}`.execute(t.db);
      },
    };
    // Creating is likelier than anything else, so the plots fill up as the season goes.
    const weighted = [
      ...Array<string>(5).fill('create'),
      'resend',
      'edit',
      'edit',
      'edit',
      'softDelete',
      'softDelete',
      'undoDelete',
      'leadRestore',
      'importCsv',
      'moveToAnotherPlot',
      'hardDelete',
      'toggleMany',
      'bulkInsert',
    ];
    // Some harvests first, then every kind once in a shuffled order, then a weighted mix.
    const sequence = [
      ...Array<string>(6).fill('create'),
      ...random.shuffle(Object.keys(steps)),
      ...Array.from({ length: 100 }, () => pick(weighted)),
    ];
    for (const [step, name] of sequence.entries()) {
      await steps[name]!();
      expect(await kept(trial.trialId), `after step ${step} (${name})`).toEqual(
        await fromRawRows(trial.trialId),
      );
    }
    // The totals were not trivially empty at the end.
    expect((await kept(trial.trialId)).length).toBeGreaterThan(3);

    // A plot deleted with its harvests takes its totals with it.
    const [first] = await kept(trial.trialId);
    await t.db.deleteFrom('plots').where('id', '=', first!.plot_id).execute();
    expect(await kept(trial.trialId)).toEqual(await fromRawRows(trial.trialId));
    expect((await kept(trial.trialId)).some((r) => r.plot_id === first!.plot_id)).toBe(false);
    // So does a deleted trial.
    await t.db.deleteFrom('trials').where('id', '=', trial.trialId).execute();
    expect(await kept(trial.trialId)).toEqual([]);
  }, 120_000);

  it('lose no harvest when several connections write to one plot at once', async () => {
    const other = await insertBlocksTrial(t.db, {
      trial: { slug: 'kept-totals-concurrent', title: 'Busy plot', crop: 'squash' },
      siteName: 'Long Acre',
      entryNames: ['Amber Lantern', 'Drumlin Green'],
      blocks: 1,
      trait: vigorScoreTrait,
    });
    const plotId = other.plotIds[101]!;
    // The trial data-version triggers lock the trial row, which alone would make these writers
    // take turns: without them, the totals triggers' own plot locks must keep every harvest.
    const versionTriggers = (on: boolean) =>
      sql.raw(
        ['insert', 'update', 'delete']
          .map(
            (op) =>
              `alter table harvests ${on ? 'enable' : 'disable'} trigger harvests_data_version_${op};`,
          )
          .join('\n'),
      );
    await versionTriggers(false).execute(t.db);
    const pool = new pg.Pool({ connectionString: t.database.url, max: 6 });
    try {
      const writer = async (w: number) => {
        const client = await pool.connect();
        try {
          for (let round = 0; round < 5; round++) {
            await client.query('begin');
            // Every writer picks on the same new days at the same time (a day counts once for
            // the plot however many writers log it first), masses with decimals.
            const ids: string[] = [];
            for (let k = 0; k < 3; k++) {
              const { rows } = await client.query<{ id: string }>(
                `insert into harvests (trial_id, plot_id, harvested_on, fruit_count, mass_g, grade)
                 values ($1, $2, $3, $4, $5, $6) returning id`,
                [
                  other.trialId,
                  plotId,
                  `2026-08-${String(1 + round * 3 + k).padStart(2, '0')}`,
                  w + k,
                  100.25 + w,
                  k === 2 ? 'cull' : 'marketable',
                ],
              );
              ids.push(rows[0]!.id);
            }
            // One of them soft-deleted in the same transaction, in one round of each writer.
            if (round === 2)
              await client.query('update harvests set deleted_at = now() where id = $1', [ids[0]]);
            await client.query('select pg_sleep(0.01)');
            await client.query('commit');
          }
        } finally {
          client.release();
        }
      };
      await Promise.all([0, 1, 2, 3, 4, 5].map(writer));
    } finally {
      await pool.end();
      await versionTriggers(true).execute(t.db);
    }
    const totals = await kept(other.trialId);
    expect(totals).toEqual(await fromRawRows(other.trialId));
    // 6 writers × 5 rounds × 3 harvests, 6 of them soft-deleted.
    expect(totals[0]!.harvests).toBe(6 * 5 * 3 - 6);
  }, 60_000);
});

import path from 'node:path';
import { sql } from 'kysely';
import ts from 'typescript';
import { getMigrations } from 'better-auth/db/migration';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  createEmptyDatabase,
  createTestDatabase,
  type TestDatabase,
} from '../support/test-database';
import { createDb, createPool } from '../../db/database';
import { migrateDownAll, migrateToLatest } from '../../db/migrator';
import { migrations } from '../../db/migrations/index';
import { createAuth } from '../../server/auth/auth';
import { parseEnv } from '../../server/env';
import pino from 'pino';

/**
 * Tables and columns as db/schema.ts declares them in the `Database` interface, read by the
 * TypeScript compiler itself, so the interface is written once and still checked here.
 */
function declaredColumns(): Record<string, string[]> {
  const file = path.resolve('db/schema.ts');
  const program = ts.createProgram([file], {
    target: ts.ScriptTarget.ES2022,
    module: ts.ModuleKind.ESNext,
    moduleResolution: ts.ModuleResolutionKind.Bundler,
    strict: true,
    skipLibCheck: true,
    noEmit: true,
    types: [],
  });
  const checker = program.getTypeChecker();
  const database = program
    .getSourceFile(file)!
    .statements.find(
      (s): s is ts.InterfaceDeclaration =>
        ts.isInterfaceDeclaration(s) && s.name.text === 'Database',
    )!;
  return Object.fromEntries(
    checker.getPropertiesOfType(checker.getTypeAtLocation(database)).map((table) => [
      table.name,
      checker
        .getPropertiesOfType(checker.getTypeOfSymbolAtLocation(table, database))
        .map((column) => column.name)
        .sort(),
    ]),
  );
}

let d: TestDatabase;
beforeAll(async () => {
  d = await createTestDatabase();
});
afterAll(async () => {
  await d.drop();
});

describe('migrations', () => {
  it('go up from nothing and all the way down again, leaving no tables', async () => {
    const e = await createEmptyDatabase();
    try {
      const up = await migrateToLatest(e.db);
      expect(up.length).toBeGreaterThanOrEqual(2);
      const down = await migrateDownAll(e.db);
      expect(down).toEqual([...up].reverse());
      const tables = await e.db.introspection.getTables();
      expect(tables.map((t) => t.name).filter((n) => !n.startsWith('kysely_'))).toEqual([]);
      expect(await migrateToLatest(e.db)).toEqual(up);
    } finally {
      await e.drop();
    }
  });

  it('run once when several servers start together on an empty database', async () => {
    const e = await createEmptyDatabase();
    const others = [createPool(e.url, 2), createPool(e.url, 2)].map((pool) => createDb(pool));
    try {
      const runs = await Promise.all([e.db, ...others].map((db) => migrateToLatest(db)));
      // One server applied everything; the others waited on the lock and found nothing to do.
      const all = Object.keys(migrations).sort();
      expect(runs.map((r) => r.length).sort((a, b) => a - b)).toEqual([0, 0, all.length]);
      expect(runs.flat().sort()).toEqual(all);
      const applied = await sql<{
        n: number;
      }>`select count(*)::int as n from kysely_migration`.execute(e.db);
      expect(applied.rows[0]!.n).toBe(all.length);
    } finally {
      await Promise.all(others.map((db) => db.destroy()));
      await e.drop();
    }
  });

  it('match the typed Database interface, table by table and column by column', async () => {
    const tables = await d.db.introspection.getTables();
    const actual = Object.fromEntries(
      tables
        // The mail queue's own tables live in pg-boss's schema, which it creates and upgrades.
        .filter((t) => t.schema === 'public' && !t.name.startsWith('kysely_'))
        .map((t) => [t.name, t.columns.map((c) => c.name).sort()]),
    );
    expect(actual).toEqual(declaredColumns());
  });

  it('create the account tables exactly as the sign-in library expects them', async () => {
    const env = parseEnv({ NODE_ENV: 'test' });
    const logger = pino({ level: 'silent' });
    const auth = createAuth({
      pool: d.pool,
      db: d.db,
      env,
      logger,
      baseUrl: 'http://127.0.0.1:1',
      secret: 'x'.repeat(40),
      mail: { enqueue: async () => '', stop: async () => {} },
    });
    const { toBeCreated, toBeAdded } = await getMigrations(auth.options);
    expect(toBeCreated).toEqual([]);
    expect(toBeAdded).toEqual([]);
  });
});

describe('the database refuses bad data itself', () => {
  async function trialWithPlot() {
    const trial = await d.db
      .insertInto('trials')
      .values({
        slug: `t-${Math.random().toString(36).slice(2, 8)}`,
        title: 'Rules',
        crop: 'Okra',
        season: '2026',
        design: 'rcbd',
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const site = await d.db
      .insertInto('sites')
      .values({ trial_id: trial.id, name: 'North bed' })
      .returning('id')
      .executeTakeFirstOrThrow();
    const entry = await d.db
      .insertInto('entries')
      .values({ trial_id: trial.id, name: 'Velvet Lantern', code: 'VL', entry_type: 'heirloom' })
      .returning('id')
      .executeTakeFirstOrThrow();
    const plot = await d.db
      .insertInto('plots')
      .values({
        trial_id: trial.id,
        site_id: site.id,
        entry_id: entry.id,
        block: 1,
        position: 1,
        plot_number: 101,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    return { trialId: trial.id, siteId: site.id, entryId: entry.id, plotId: plot.id };
  }

  const code = async (p: Promise<unknown>) => {
    try {
      await p;
      return 'accepted';
    } catch (err) {
      return (err as { code?: string }).code;
    }
  };

  it('refuses a negative harvest mass (check constraint 23514)', async () => {
    const { trialId, plotId } = await trialWithPlot();
    expect(
      await code(
        d.db
          .insertInto('harvests')
          .values({
            trial_id: trialId,
            plot_id: plotId,
            harvested_on: '2026-07-01',
            fruit_count: 3,
            mass_g: -5,
            grade: 'marketable',
          })
          .execute(),
      ),
    ).toBe('23514');
  });

  it('refuses a plot placed in a site of another trial (foreign key 23503)', async () => {
    const a = await trialWithPlot();
    const b = await trialWithPlot();
    expect(
      await code(
        d.db
          .insertInto('plots')
          .values({
            trial_id: a.trialId,
            site_id: b.siteId,
            entry_id: a.entryId,
            block: 1,
            position: 2,
            plot_number: 102,
          })
          .execute(),
      ),
    ).toBe('23503');
  });

  it('refuses a harvest whose plot belongs to another trial', async () => {
    const a = await trialWithPlot();
    const b = await trialWithPlot();
    expect(
      await code(
        d.db
          .insertInto('harvests')
          .values({
            trial_id: a.trialId,
            plot_id: b.plotId,
            harvested_on: '2026-07-01',
            fruit_count: 1,
            mass_g: 10,
            grade: 'cull',
          })
          .execute(),
      ),
    ).toBe('23503');
  });

  it('refuses two plots with one plot number at a site (unique 23505)', async () => {
    const a = await trialWithPlot();
    expect(
      await code(
        d.db
          .insertInto('plots')
          .values({
            trial_id: a.trialId,
            site_id: a.siteId,
            entry_id: a.entryId,
            block: 2,
            position: 1,
            plot_number: 101,
          })
          .execute(),
      ),
    ).toBe('23505');
  });

  it('refuses an unknown design, a score trait without its scale, and NaN values', async () => {
    const a = await trialWithPlot();
    expect(
      await code(
        d.db
          .insertInto('trials')
          .values({
            slug: 'bad-design',
            title: 'x',
            crop: 'x',
            season: 'x',
            design: 'latin' as never,
          })
          .execute(),
      ),
    ).toBe('23514');
    expect(
      await code(
        d.db
          .insertInto('traits')
          .values({
            trial_id: a.trialId,
            key: 'vigor',
            label: 'Vigor',
            quantity_kind: 'score',
            basis: 'plot',
            direction: 'higher',
          })
          .execute(),
      ),
    ).toBe('23514');
    const trait = await d.db
      .insertInto('traits')
      .values({
        trial_id: a.trialId,
        key: 'height',
        label: 'Height',
        quantity_kind: 'length',
        basis: 'plant',
        direction: 'lower',
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    expect(
      await code(
        sql`insert into observations (trial_id, plot_id, trait_id, observed_on, value) values (${a.trialId}, ${a.plotId}, ${trait.id}, '2026-07-01', 'NaN'::float8)`.execute(
          d.db,
        ),
      ),
    ).toBe('23514');
  });

  it('keeps who and when on every row and moves updated_at on change', async () => {
    const a = await trialWithPlot();
    const before = await d.db
      .selectFrom('plots')
      .select(['created_at', 'updated_at'])
      .where('id', '=', a.plotId)
      .executeTakeFirstOrThrow();
    await new Promise((r) => setTimeout(r, 10));
    await d.db.updateTable('plots').set({ plants_set: 6 }).where('id', '=', a.plotId).execute();
    const after = await d.db
      .selectFrom('plots')
      .select(['created_at', 'updated_at'])
      .where('id', '=', a.plotId)
      .executeTakeFirstOrThrow();
    expect(after.created_at).toEqual(before.created_at);
    expect(after.updated_at.getTime()).toBeGreaterThan(before.updated_at.getTime());
  });
});

describe('the migration list', () => {
  it('names every migration file in db/migrations, in order', async () => {
    const fs = await import('node:fs');
    const { migrations } = await import('../../db/migrations/index');
    const files = fs
      .readdirSync(new URL('../../db/migrations/', import.meta.url))
      .filter((f) => f !== 'index.ts' && f.endsWith('.ts'))
      .map((f) => f.replace(/\.ts$/, ''))
      .sort();
    expect(Object.keys(migrations)).toEqual(files);
  });
});

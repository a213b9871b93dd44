import { sql, type Transaction } from 'kysely';
import type { DB } from '../../db/database';
import type {
  Database,
  EntriesTable,
  NewTrial,
  PlotsTable,
  SitesTable,
  TraitsTable,
  TrialUpdate,
} from '../../db/schema';
import type { Insertable, Updateable } from 'kysely';

export type Conn = DB | Transaction<Database>;

export function findUserByEmail(db: Conn, email: string) {
  return db
    .selectFrom('users')
    .select(['id', 'email'])
    .where(sql`lower(email)`, '=', email.toLowerCase())
    .executeTakeFirst();
}

export function insertTrial(db: Conn, values: NewTrial) {
  return db.insertInto('trials').values(values).returning(['id', 'slug']).executeTakeFirstOrThrow();
}

export function insertLead(db: Conn, trialId: string, userId: string, by: string) {
  return db
    .insertInto('trial_members')
    .values({ trial_id: trialId, user_id: userId, role: 'lead', created_by: by, updated_by: by })
    .execute();
}

/** Locks the trial row so layout changes and their checks happen one at a time. */
export function lockTrial(db: Conn, trialId: string) {
  return db
    .selectFrom('trials')
    .selectAll()
    .where('id', '=', trialId)
    .forUpdate()
    .executeTakeFirstOrThrow();
}

/**
 * Records that hang on the plots: harvests and measurements (deleted ones too — they are
 * still history), plot-level field events and plot photos. Any of them locks the layout.
 */
export function plotDependents(db: Conn, trialId: string) {
  return db
    .selectNoFrom([
      sql<number>`(select count(*)::int from harvests where trial_id = ${trialId})`.as('harvests'),
      sql<number>`(select count(*)::int from observations where trial_id = ${trialId})`.as(
        'observations',
      ),
      sql<number>`(select count(*)::int from field_events where trial_id = ${trialId} and plot_id is not null)`.as(
        'plotEvents',
      ),
      sql<number>`(select count(*)::int from photos where trial_id = ${trialId} and plot_id is not null)`.as(
        'plotPhotos',
      ),
    ])
    .executeTakeFirstOrThrow();
}

export function countPlots(db: Conn, trialId: string) {
  return db
    .selectFrom('plots')
    .select(sql<number>`count(*)::int`.as('n'))
    .where('trial_id', '=', trialId)
    .executeTakeFirstOrThrow()
    .then((r) => r.n);
}

export function listEntries(db: Conn, trialId: string) {
  return db
    .selectFrom('entries as e')
    .leftJoin('varieties as v', 'v.id', 'e.variety_id')
    .selectAll('e')
    .select(['v.slug as variety_slug', 'v.name as variety_name'])
    .where('e.trial_id', '=', trialId)
    .orderBy('e.code')
    .execute();
}

export function listSites(db: Conn, trialId: string) {
  return db
    .selectFrom('sites')
    .selectAll()
    .where('trial_id', '=', trialId)
    .orderBy('name')
    .execute();
}

export function listTraits(db: Conn, trialId: string) {
  return db
    .selectFrom('traits as t')
    .selectAll('t')
    .select(
      sql<number>`(select count(*)::int from observations o where o.trait_id = t.id)`.as(
        'observation_count',
      ),
    )
    .where('t.trial_id', '=', trialId)
    .orderBy('t.sort_order')
    .orderBy('t.label')
    .execute();
}

export function listPlots(db: Conn, trialId: string) {
  return db
    .selectFrom('plots as p')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .selectAll('p')
    .where('p.trial_id', '=', trialId)
    .orderBy('s.name')
    .orderBy('p.block')
    .orderBy('p.position')
    .execute();
}

export function updateTrial(db: Conn, trialId: string, values: TrialUpdate) {
  return db.updateTable('trials').set(values).where('id', '=', trialId).execute();
}

type Part = 'entries' | 'sites' | 'traits';

export function insertPart<P extends Part>(db: Conn, table: P, values: Insertable<Database[P]>) {
  return db.insertInto(table).values(values).returning('id').executeTakeFirstOrThrow();
}

/*
 * Updates of one row of the trial's own (undefined when it is not in this trial), one per table:
 * Kysely types `set` only for a table it knows, not for one chosen at run time.
 */
export function updateEntryRow(db: Conn, trialId: string, id: string, v: Updateable<EntriesTable>) {
  return db
    .updateTable('entries')
    .set(v)
    .where((eb) => eb.and({ id, trial_id: trialId }))
    .returning('id')
    .executeTakeFirst();
}

export function updateSiteRow(db: Conn, trialId: string, id: string, v: Updateable<SitesTable>) {
  return db
    .updateTable('sites')
    .set(v)
    .where((eb) => eb.and({ id, trial_id: trialId }))
    .returning('id')
    .executeTakeFirst();
}

export function updateTraitRow(db: Conn, trialId: string, id: string, v: Updateable<TraitsTable>) {
  return db
    .updateTable('traits')
    .set(v)
    .where((eb) => eb.and({ id, trial_id: trialId }))
    .returningAll()
    .executeTakeFirst();
}

export function deletePart(db: Conn, table: Part, trialId: string, id: string) {
  return db
    .deleteFrom(table)
    .where('id', '=', id)
    .where('trial_id', '=', trialId)
    .returning('id')
    .executeTakeFirst();
}

export function findPart(db: Conn, table: Part, trialId: string, id: string) {
  return db
    .selectFrom(table)
    .select('id')
    .where('id', '=', id)
    .where('trial_id', '=', trialId)
    .executeTakeFirst();
}

/** A group's register varieties by name, to pick an entry's variety from. */
export function groupRegister(db: Conn, groupId: string) {
  return db
    .selectFrom('varieties')
    .select(['id', 'slug', 'name'])
    .where('group_id', '=', groupId)
    .orderBy('name')
    .execute();
}

/** A trial's entries with what links each to its group's register. */
export function entriesOf(db: Conn, trialId: string) {
  return db
    .selectFrom('entries')
    .select(['id', 'name', 'entry_type', 'seed_source'])
    .where('trial_id', '=', trialId)
    .execute();
}

/** What an entry's register variety is found by. */
export function findEntry(db: Conn, trialId: string, id: string) {
  return db
    .selectFrom('entries')
    .select(['name', 'entry_type', 'seed_source'])
    .where('id', '=', id)
    .where('trial_id', '=', trialId)
    .executeTakeFirstOrThrow();
}

export function countTraitObservations(db: Conn, traitId: string) {
  return db
    .selectFrom('observations')
    .select(sql<number>`count(*)::int`.as('n'))
    .where('trait_id', '=', traitId)
    .executeTakeFirstOrThrow()
    .then((r) => r.n);
}

export function maxTraitOrder(db: Conn, trialId: string) {
  return db
    .selectFrom('traits')
    .select(sql<number>`coalesce(max(sort_order), -1)::int`.as('n'))
    .where('trial_id', '=', trialId)
    .executeTakeFirstOrThrow()
    .then((r) => r.n);
}

export function deletePlots(db: Conn, trialId: string) {
  return db.deleteFrom('plots').where('trial_id', '=', trialId).execute();
}

export function insertPlots(db: Conn, rows: Insertable<PlotsTable>[]) {
  if (rows.length === 0) return Promise.resolve([]);
  return db.insertInto('plots').values(rows).execute();
}

/** Keeps an entry's plots at its spacing while the layout can still change. */
export function setEntryPlotSpacing(db: Conn, trialId: string, entryId: string, mm: number) {
  return db
    .updateTable('plots')
    .set({ in_row_spacing_mm: mm })
    .where('trial_id', '=', trialId)
    .where('entry_id', '=', entryId)
    .execute();
}

export function updatePlanting(
  db: Conn,
  trialId: string,
  plotId: string,
  values: Updateable<PlotsTable>,
) {
  return db
    .updateTable('plots')
    .set(values)
    .where('id', '=', plotId)
    .where('trial_id', '=', trialId)
    .returning('id')
    .executeTakeFirst();
}

/** Columns a copied row takes over as they are; the rest are the copy's own. */
const ownColumns = ['id', 'trial_id', 'created_at', 'updated_at', 'created_by', 'updated_by'];

/**
 * Copies every entry, site or trait of one trial into another, column for column (read from
 * the database, so a column added later is copied too), with new ids.
 */
export async function copyTrialParts(
  db: Conn,
  table: 'entries' | 'sites' | 'traits',
  fromTrialId: string,
  toTrialId: string,
  by: string,
) {
  const { rows } = await sql<{ column_name: string }>`
    select column_name from information_schema.columns
    where table_schema = current_schema() and table_name = ${table}
    order by ordinal_position`.execute(db);
  const columns = rows.map((r) => r.column_name).filter((c) => !ownColumns.includes(c));
  const refs = sql.join(columns.map((c) => sql.ref(c)));
  await sql`
    insert into ${sql.table(table)} (trial_id, created_by, updated_by, ${refs})
    select ${toTrialId}, ${by}, ${by}, ${refs} from ${sql.table(table)}
    where trial_id = ${fromTrialId}`.execute(db);
}

/** The in-row spacing most of a trial's plots were planted at (mm), or null. */
export async function commonPlotSpacing(db: Conn, trialId: string): Promise<number | null> {
  const row = await db
    .selectFrom('plots')
    .select('in_row_spacing_mm')
    .where('trial_id', '=', trialId)
    .where('in_row_spacing_mm', 'is not', null)
    .groupBy('in_row_spacing_mm')
    .orderBy(sql`count(*)`, 'desc')
    .orderBy('in_row_spacing_mm')
    .limit(1)
    .executeTakeFirst();
  return row?.in_row_spacing_mm ?? null;
}

/** The trait as stored, locked until the caller's transaction ends (an edit reads then writes). */
export function lockTrait(db: Conn, trialId: string, traitId: string) {
  return db
    .selectFrom('traits')
    .selectAll()
    .where('id', '=', traitId)
    .where('trial_id', '=', trialId)
    .forUpdate()
    .executeTakeFirst();
}

/** The results sheet names its traits by key: follow a trait's new key there. */
export function renameSheetTraitKey(db: Conn, trialId: string, from: string, to: string) {
  return db
    .updateTable('results_sheets')
    .set({
      traits: sql<string>`(
        select coalesce(jsonb_agg(case when e->>'key' = ${from}
          then jsonb_set(e, '{key}', to_jsonb(${to}::text)) else e end order by n), '[]'::jsonb)
        from jsonb_array_elements(traits) with ordinality as x(e, n))`,
    })
    .where('trial_id', '=', trialId)
    .execute();
}

import {
  type Expression,
  type Insertable,
  type Selectable,
  type SelectQueryBuilder,
  type SqlBool,
  type Updateable,
  sql,
} from 'kysely';
import type { LogSortKey, RecordTable } from '../../common/contracts/records';
import type { DB } from '../../db/database';
import type { Database, PlotsTable } from '../../db/schema';

type Rows = { [T in RecordTable]: Selectable<Database[T]> };
type NewRows = { [T in RecordTable]: Insertable<Database[T]> & { id: string } };
type Changes = { [T in RecordTable]: Updateable<Database[T]> };

/** What every record table has, named so generic code can read it. */
type RecordBase = {
  id: string;
  trial_id: string;
  /** a field event may concern a whole site */
  plot_id: string | null;
  version: number;
  deleted_at: Date | null;
};
/** A stored record as its table holds it. */
export type { RecordTable };
export type RecordRow<T extends RecordTable = RecordTable> = Rows[T] & RecordBase;
/** A new record as a service gives it; the trial and who made it are added on insert. */
export type NewRecord<T extends RecordTable> = Omit<
  NewRows[T],
  'trial_id' | 'created_by' | 'updated_by'
>;
/** Values a service changes on an edit. */
export type RecordChange<T extends RecordTable> = Changes[T];
/** What every record's life changes besides its values: deleted or not, and who did it. */
export type Stamps = { trialId: string; actorId: string };
type Lifecycle = { deleted_at?: Date | null };

interface RecordQueries<T extends RecordTable> {
  byId(db: DB, id: string, lock: boolean): Promise<RecordRow<T> | undefined>;
  /** The new row with its audit entry written, or undefined when the id is taken. */
  insertIfNew(db: DB, values: NewRecord<T>, stamps: Stamps): Promise<RecordRow<T> | undefined>;
  /** Applies the change and moves the version on by one. */
  update(
    db: DB,
    id: string,
    values: RecordChange<T> | Lifecycle,
    actorId: string,
  ): Promise<RecordRow<T>>;
}

const stamped = (stamps: Stamps) => ({
  trial_id: stamps.trialId,
  created_by: stamps.actorId,
  updated_by: stamps.actorId,
});

/** A timestamp as JSON.stringify writes a Date (ISO 8601, milliseconds, UTC). */
const isoText = (column: string) =>
  sql`to_char(${sql.ref(column)} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;

/**
 * The audit entry of the record the same statement inserted as `r` (the record as stored, as
 * JSON with its timestamps written the way the audit writer writes them): an insert and its
 * audit row in one round trip, atomic without a transaction of their own.
 */
const createdAudit = (table: RecordTable, actorId: string) => sql<{ id: number }>`(
  insert into audit_log (trial_id, table_name, record_id, action, before, after, actor_id)
  select r.trial_id, ${table}, r.id, 'create', null,
    to_jsonb(r) || jsonb_build_object(
      'created_at', ${isoText('r.created_at')},
      'updated_at', ${isoText('r.updated_at')},
      'deleted_at', ${isoText('r.deleted_at')}),
    ${actorId}
  from r
  returning id)`;

// The three record tables share id, version and deleted_at but Kysely types a query on one
// named table at a time, so each table has its own (identical) statements.
const queries: { [T in RecordTable]: RecordQueries<T> } = {
  harvests: {
    byId: (db, id, lock) => {
      const q = db.selectFrom('harvests').selectAll().where('id', '=', id);
      return (lock ? q.forUpdate() : q).executeTakeFirst();
    },
    insertIfNew: (db, values, stamps) =>
      db
        .with('r', (q) =>
          q
            .insertInto('harvests')
            .values({ ...values, ...stamped(stamps) })
            .onConflict((oc) => oc.column('id').doNothing())
            .returningAll(),
        )
        .with('audit', () => createdAudit('harvests', stamps.actorId))
        .selectFrom('r')
        .selectAll()
        .executeTakeFirst(),
    update: (db, id, values, actorId) =>
      db
        .updateTable('harvests')
        .set((eb) => ({ ...values, updated_by: actorId, version: eb('version', '+', 1) }))
        .where('id', '=', id)
        .returningAll()
        .executeTakeFirstOrThrow(),
  },
  observations: {
    byId: (db, id, lock) => {
      const q = db.selectFrom('observations').selectAll().where('id', '=', id);
      return (lock ? q.forUpdate() : q).executeTakeFirst();
    },
    insertIfNew: (db, values, stamps) =>
      db
        .with('r', (q) =>
          q
            .insertInto('observations')
            .values({ ...values, ...stamped(stamps) })
            .onConflict((oc) => oc.column('id').doNothing())
            .returningAll(),
        )
        .with('audit', () => createdAudit('observations', stamps.actorId))
        .selectFrom('r')
        .selectAll()
        .executeTakeFirst(),
    update: (db, id, values, actorId) =>
      db
        .updateTable('observations')
        .set((eb) => ({ ...values, updated_by: actorId, version: eb('version', '+', 1) }))
        .where('id', '=', id)
        .returningAll()
        .executeTakeFirstOrThrow(),
  },
  field_events: {
    byId: (db, id, lock) => {
      const q = db.selectFrom('field_events').selectAll().where('id', '=', id);
      return (lock ? q.forUpdate() : q).executeTakeFirst();
    },
    insertIfNew: (db, values, stamps) =>
      db
        .with('r', (q) =>
          q
            .insertInto('field_events')
            .values({ ...values, ...stamped(stamps) })
            .onConflict((oc) => oc.column('id').doNothing())
            .returningAll(),
        )
        .with('audit', () => createdAudit('field_events', stamps.actorId))
        .selectFrom('r')
        .selectAll()
        .executeTakeFirst(),
    update: (db, id, values, actorId) =>
      db
        .updateTable('field_events')
        .set((eb) => ({ ...values, updated_by: actorId, version: eb('version', '+', 1) }))
        .where('id', '=', id)
        .returningAll()
        .executeTakeFirstOrThrow(),
  },
};

export function recordById<T extends RecordTable>(db: DB, table: T, id: string, lock = false) {
  return queries[table].byId(db, id, lock);
}

export function insertRecordIfNew<T extends RecordTable>(
  db: DB,
  table: T,
  values: NewRecord<T>,
  stamps: Stamps,
) {
  return queries[table].insertIfNew(db, values, stamps);
}

export function updateRecord<T extends RecordTable>(
  db: DB,
  table: T,
  id: string,
  values: RecordChange<T> | Lifecycle,
  actorId: string,
) {
  return queries[table].update(db, id, values, actorId);
}

export function plotForUpdate(db: DB, id: string) {
  return db.selectFrom('plots').selectAll().where('id', '=', id).forUpdate().executeTakeFirst();
}

/** The stand count and who changed it; a plot has no record version. */
export function updatePlotStand(
  db: DB,
  id: string,
  values: Pick<Updateable<PlotsTable>, 'plants_surviving' | 'updated_by'>,
) {
  return db
    .updateTable('plots')
    .set(values)
    .where('id', '=', id)
    .returningAll()
    .executeTakeFirstOrThrow();
}

export function plotsOfTrial(db: DB, trialId: string, siteId?: string) {
  return db
    .selectFrom('plots as p')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .innerJoin('entries as e', 'e.id', 'p.entry_id')
    .select([
      'p.id as plotId',
      'p.site_id as siteId',
      's.name as siteName',
      'p.plot_number as plotNumber',
      'p.block',
      'p.position',
      'p.entry_id as entryId',
      'e.code as entryCode',
      'e.name as entryName',
      'p.plants_set as plantsSet',
      'p.plants_surviving as plantsSurviving',
      'p.treatment',
    ])
    .where('p.trial_id', '=', trialId)
    .$if(siteId !== undefined, (q) => q.where('p.site_id', '=', siteId!))
    .orderBy('s.name')
    .orderBy('p.plot_number')
    .execute();
}

export function plotInTrial(db: DB, trialId: string, plotId: string) {
  return db
    .selectFrom('plots')
    .select(['id', 'site_id', 'plants_set', 'plants_surviving'])
    .where('trial_id', '=', trialId)
    .where('id', '=', plotId)
    .executeTakeFirst();
}

export function siteInTrial(db: DB, trialId: string, siteId: string) {
  return db
    .selectFrom('sites')
    .select(['id', 'name'])
    .where('trial_id', '=', trialId)
    .where('id', '=', siteId)
    .executeTakeFirst();
}

export function traitsOfTrial(db: DB, trialId: string) {
  return db
    .selectFrom('traits')
    .selectAll()
    .where('trial_id', '=', trialId)
    .orderBy('sort_order')
    .orderBy('label')
    .execute();
}

export function traitInTrial(db: DB, trialId: string, traitId: string) {
  return db
    .selectFrom('traits')
    .selectAll()
    .where('trial_id', '=', trialId)
    .where('id', '=', traitId)
    .executeTakeFirst();
}

export interface ListFilters {
  siteId?: string;
  plotId?: string;
  from?: string;
  to?: string;
  includeDeleted?: boolean;
  ids?: string[];
  /** words to find in the entry, site, plot number or note (and the trait of an observation) */
  search?: string;
}
/** Which rows of the ordered list one page holds, and the column a reader sorted it by. */
export interface PageWindow {
  offset: number;
  limit: number;
  sort?: { by: LogSortKey; desc: boolean };
}

/**
 * The columns a log sorted by `by` is ordered by first (the log's own order then breaks the
 * ties): a plot by its number, then its site, as several sites number their plots alike.
 */
function sortColumns(by: LogSortKey, date: 'r.harvested_on' | 'r.observed_on') {
  switch (by) {
    case 'date':
      return [date];
    case 'plot':
      return ['p.plot_number', 's.name'];
    case 'entry':
      return ['e.name', 'e.code'];
    default: {
      const never: never = by;
      return never;
    }
  }
}

/** Orders a log query by the reader's column first, when one was chosen. */
function sortedFirst<D, TB extends keyof D, O>(
  query: SelectQueryBuilder<D, TB, O>,
  window: PageWindow | undefined,
  date: 'r.harvested_on' | 'r.observed_on',
): SelectQueryBuilder<D, TB, O> {
  const sort = window?.sort;
  if (!sort) return query;
  return sortColumns(sort.by, date).reduce(
    (q, column) => q.orderBy(sql.ref(column), sort.desc ? 'desc' : 'asc'),
    query,
  );
}

// Every record list selects its table as `r`, with plots as `p`, sites `s` and entries `e`.
/** The bookkeeping every record carries: id, version, deletion and who wrote it when. */
const recordColumns = [
  'r.id',
  'r.version',
  'r.deleted_at as deletedAt',
  'r.created_at as createdAt',
  'r.updated_at as updatedAt',
  sql<string | null>`(select name from users where id = r.created_by)`.as('createdByName'),
  sql<string | null>`(select name from users where id = r.updated_by)`.as('updatedByName'),
] as const;

/** Where a harvest or observation was taken: its plot, site and entry. */
const plotColumns = [
  'r.plot_id as plotId',
  'p.site_id as siteId',
  's.name as siteName',
  'p.plot_number as plotNumber',
  'p.block',
  'p.entry_id as entryId',
  'e.code as entryCode',
  'e.name as entryName',
  'p.treatment',
] as const;

/** `%text%` for ILIKE, with the user's own % and _ taken literally. */
const containing = (text: string) => `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

/**
 * The filters a harvest or observation list shares, on the aliases above. `dated` is the
 * record's own date column; `searched` adds columns the search also reads.
 */
function plotRecordFilter(
  f: ListFilters,
  dated: 'r.harvested_on' | 'r.observed_on',
  searched: string[] = [],
): Expression<SqlBool> {
  const date = sql.ref(dated);
  const parts = [
    f.includeDeleted ? null : sql`r.deleted_at is null`,
    f.siteId === undefined ? null : sql`p.site_id = ${f.siteId}`,
    f.plotId === undefined ? null : sql`r.plot_id = ${f.plotId}`,
    f.from === undefined ? null : sql`${date} >= ${f.from}`,
    f.to === undefined ? null : sql`${date} <= ${f.to}`,
    f.ids === undefined ? null : sql`r.id = any(${f.ids}::uuid[])`,
    f.search
      ? sql`concat_ws(' ', ${sql.join([
          sql`e.name, e.code, s.name, p.plot_number::text, r.note`,
          ...searched.map((c) => sql.ref(c)),
        ])}) ilike ${containing(f.search)}`
      : null,
  ].filter((x) => x !== null);
  return parts.length ? sql<SqlBool>`${sql.join(parts, sql` and `)}` : sql<SqlBool>`true`;
}

type HarvestFilters = ListFilters & { grade?: 'marketable' | 'cull' };
const harvestsOf = (db: DB, trialId: string, f: HarvestFilters) =>
  db
    .selectFrom('harvests as r')
    .innerJoin('plots as p', 'p.id', 'r.plot_id')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .innerJoin('entries as e', 'e.id', 'p.entry_id')
    .where('r.trial_id', '=', trialId)
    .where(plotRecordFilter(f, 'r.harvested_on'))
    .$if(f.grade !== undefined, (q) => q.where('r.grade', '=', f.grade!));

/** Harvests newest first (or as the window sorts them); one page of them when a window is given. */
export function listHarvests(db: DB, trialId: string, f: HarvestFilters, window?: PageWindow) {
  return harvestsOf(db, trialId, f)
    .select([
      ...recordColumns,
      ...plotColumns,
      'r.harvested_on as harvestedOn',
      'r.fruit_count as fruitCount',
      'r.mass_g as massG',
      'r.grade',
      'r.note',
    ])
    .$call((q) => sortedFirst(q, window, 'r.harvested_on'))
    .orderBy('r.harvested_on', 'desc')
    .orderBy('s.name')
    .orderBy('p.plot_number')
    .orderBy('r.created_at')
    .orderBy('r.id')
    .$if(window !== undefined, (q) => q.limit(window!.limit).offset(window!.offset))
    .execute();
}

/** How many harvests match, and their mass, on every page. */
export function harvestTotals(db: DB, trialId: string, f: HarvestFilters) {
  return harvestsOf(db, trialId, f)
    .select([
      sql<number>`count(*)::int`.as('total'),
      sql<number>`coalesce(sum(r.mass_g), 0)::float8`.as('totalMassG'),
    ])
    .executeTakeFirstOrThrow();
}

const observationsOf = (db: DB, trialId: string, f: ListFilters & { traitId?: string }) =>
  db
    .selectFrom('observations as r')
    .innerJoin('plots as p', 'p.id', 'r.plot_id')
    .innerJoin('sites as s', 's.id', 'p.site_id')
    .innerJoin('entries as e', 'e.id', 'p.entry_id')
    .innerJoin('traits as t', 't.id', 'r.trait_id')
    .where('r.trial_id', '=', trialId)
    .where(plotRecordFilter(f, 'r.observed_on', ['t.label']))
    .$if(f.traitId !== undefined, (q) => q.where('r.trait_id', '=', f.traitId!));

/** Observations newest first (or as the window sorts them); one page of them when a window is given. */
export function listObservations(
  db: DB,
  trialId: string,
  f: ListFilters & { traitId?: string },
  window?: PageWindow,
) {
  return observationsOf(db, trialId, f)
    .select([
      ...recordColumns,
      ...plotColumns,
      'r.trait_id as traitId',
      't.key as traitKey',
      't.label as traitLabel',
      't.quantity_kind as quantityKind',
      'r.observed_on as observedOn',
      'r.value',
      'r.value_date as valueDate',
      'r.plant_number as plantNumber',
      'r.note',
    ])
    .$call((q) => sortedFirst(q, window, 'r.observed_on'))
    .orderBy('r.observed_on', 'desc')
    .orderBy('s.name')
    .orderBy('p.plot_number')
    .orderBy('t.sort_order')
    .orderBy('r.plant_number')
    .orderBy('r.id')
    .$if(window !== undefined, (q) => q.limit(window!.limit).offset(window!.offset))
    .execute();
}

/** How many observations match, on every page. */
export function observationTotals(db: DB, trialId: string, f: ListFilters & { traitId?: string }) {
  return observationsOf(db, trialId, f)
    .select(sql<number>`count(*)::int`.as('total'))
    .executeTakeFirstOrThrow();
}

export function listFieldEvents(db: DB, trialId: string, f: ListFilters) {
  return db
    .selectFrom('field_events as r')
    .innerJoin('sites as s', 's.id', 'r.site_id')
    .leftJoin('plots as p', 'p.id', 'r.plot_id')
    .select([
      ...recordColumns,
      'r.site_id as siteId',
      's.name as siteName',
      'r.plot_id as plotId',
      'p.plot_number as plotNumber',
      'r.kind',
      'r.occurred_on as occurredOn',
      'r.irrigation_method as irrigationMethod',
      'r.run_time_min as runTimeMin',
      'r.water_depth_mm as waterDepthMm',
      'r.drip_emitter_flow_l_per_h as dripEmitterFlowLPerH',
      'r.drip_emitter_spacing_mm as dripEmitterSpacingMm',
      'r.drip_line_flow_l_per_h_per_m as dripLineFlowLPerHPerM',
      'r.wetted_width_mm as wettedWidthMm',
      'r.sprinkler_rate_mm_per_h as sprinklerRateMmPerH',
      'r.hand_volume_l as handVolumeL',
      'r.wetted_area_m2 as wettedAreaM2',
      'r.rain_mm as rainMm',
      'r.amendment_kind as amendmentKind',
      'r.rate_g_per_m2 as rateGPerM2',
      'r.none_applied as noneApplied',
      'r.target_spacing_mm as targetSpacingMm',
      'r.note',
    ])
    .where('r.trial_id', '=', trialId)
    .$if(!f.includeDeleted, (q) => q.where('r.deleted_at', 'is', null))
    .$if(f.siteId !== undefined, (q) => q.where('r.site_id', '=', f.siteId!))
    .$if(f.plotId !== undefined, (q) => q.where('r.plot_id', '=', f.plotId!))
    .$if(f.from !== undefined, (q) => q.where('r.occurred_on', '>=', f.from!))
    .$if(f.to !== undefined, (q) => q.where('r.occurred_on', '<=', f.to!))
    .$if(f.ids !== undefined, (q) => q.where('r.id', 'in', f.ids!))
    .orderBy('r.occurred_on', 'desc')
    .orderBy('s.name')
    .orderBy('r.created_at')
    .execute();
}

export function completenessCounts(
  db: DB,
  trialId: string,
  q: { siteId?: string; from: string; to: string },
) {
  return Promise.all([
    db
      .selectFrom('observations as o')
      .innerJoin('plots as p', 'p.id', 'o.plot_id')
      .select([
        'o.plot_id as plotId',
        'o.trait_id as traitId',
        sql<number>`count(*)::int`.as('count'),
      ])
      .where('o.trial_id', '=', trialId)
      .where('o.deleted_at', 'is', null)
      .where('o.observed_on', '>=', q.from)
      .where('o.observed_on', '<=', q.to)
      .$if(q.siteId !== undefined, (b) => b.where('p.site_id', '=', q.siteId!))
      .groupBy(['o.plot_id', 'o.trait_id'])
      .execute(),
    db
      .selectFrom('harvests as h')
      .innerJoin('plots as p', 'p.id', 'h.plot_id')
      .select(['h.plot_id as plotId', sql<number>`count(*)::int`.as('count')])
      .where('h.trial_id', '=', trialId)
      .where('h.deleted_at', 'is', null)
      .where('h.harvested_on', '>=', q.from)
      .where('h.harvested_on', '<=', q.to)
      .$if(q.siteId !== undefined, (b) => b.where('p.site_id', '=', q.siteId!))
      .groupBy('h.plot_id')
      .execute(),
  ]);
}

/** Ids among `ids` that already exist, with the trial they belong to. */
export async function existingIds(
  db: DB,
  table: RecordTable,
  ids: string[],
): Promise<{ id: string; trial_id: string }[]> {
  if (ids.length === 0) return [];
  // Only the columns every record table has in common, so one statement serves all three.
  return db.selectFrom(table).select(['id', 'trial_id']).where('id', 'in', ids).execute();
}

import type {
  Harvest,
  createFieldEventBody,
  createHarvestBody,
  createObservationBody,
  harvestLogQuery,
  listQuery,
  observationLogQuery,
  standCountBody,
  updateFieldEventBody,
  updateHarvestBody,
  updateObservationBody,
} from '../../common/contracts/records';
import {
  type FieldEventInput,
  fieldEventProblems,
  type LogSortKey,
  observationValueProblem,
} from '../../common/contracts/records';
import type { Actor } from '../../common/policy';
import { irrigationInputsOf, waterDepthMm } from '../../common/water';
import type { DB } from '../../db/database';
import { writeAudit } from './record-audit-repository';
import { requireActorOf } from './records-actor';
import { AppError, fieldError } from '../lib/app-error';
import { authorize, type LoadedTrial } from '../trials/trial-access';
import { trialForAction } from '../trials/trials-service';
import {
  applyUpdate,
  createOnce,
  lockedRecord,
  mayUndo,
  restore,
  softDelete,
  staleVersion,
} from './record-changes';
import * as repo from './records-repository';
import type { z } from 'zod';

type Q = z.output<typeof listQuery>;
const filters = (q: Q & { q?: string }): repo.ListFilters => ({
  siteId: q.siteId,
  plotId: q.plotId,
  from: q.from,
  to: q.to,
  includeDeleted: q.includeDeleted === 'true',
  search: q.q || undefined,
});

/** Plots and their site, read inside the trial, or a 400 naming the field. */
async function plotAt(db: DB, loaded: LoadedTrial, plotId: string, path = 'body.plotId') {
  const plot = await repo.plotInTrial(db, loaded.trial.id, plotId);
  if (!plot) throw fieldError(path, 'This plot is not in the trial.');
  return plot;
}

/** A plot in the trial that the actor may write records for, at its site. */
async function writablePlot(
  db: DB,
  loaded: LoadedTrial,
  actor: Actor | null,
  plotId: string,
  path?: string,
) {
  const plot = await plotAt(db, loaded, plotId, path);
  authorize(actor, 'records.write', loaded, plot.site_id);
  return plot;
}

/** The columns a patch sets; a field left out of the body keeps its stored value. */
const givenColumns = (values: Record<string, unknown>) =>
  Object.fromEntries(Object.entries(values).filter(([, v]) => v !== undefined));

const deletedMessages = {
  harvests: 'This harvest was deleted.',
  observations: 'This observation was deleted.',
};

/** A plot's record locked for an edit at a site the actor may write; a deleted one is refused. */
async function editablePlotRecord<T extends keyof typeof deletedMessages>(
  trx: DB,
  loaded: LoadedTrial,
  actor: Actor | null,
  table: T,
  id: string,
) {
  const before = await lockedRecord(trx, table, loaded.trial.id, id);
  // Harvests and observations always have a plot (NOT NULL).
  const plot = before.plot_id && (await repo.plotInTrial(trx, loaded.trial.id, before.plot_id));
  if (!plot) throw AppError.notFound('The plot');
  authorize(actor, 'records.write', loaded, plot.site_id);
  if (before.deleted_at) throw new AppError('not_found', deletedMessages[table]);
  return before;
}

/**
 * An edit of a harvest or an observation, from the version that was read: a stale version is
 * refused with what changed, `check` refuses values that do not fit, all in one transaction.
 */
async function editPlotRecord<T extends keyof typeof deletedMessages, Out>(
  db: DB,
  slug: string,
  actor: Actor | null,
  table: T,
  id: string,
  version: number,
  values: repo.RecordChange<T>,
  read: (db: DB, trialId: string, id: string) => Promise<Out>,
  check?: (trx: DB, loaded: LoadedTrial, before: repo.RecordRow<T>) => Promise<void>,
) {
  const loaded = await trialForAction(db, slug, actor, 'records.write');
  await db.transaction().execute(async (trx) => {
    const before = await editablePlotRecord(trx, loaded, actor, table, id);
    if (before.version !== version) await staleVersion(trx, before, version, values);
    await check?.(trx, loaded, before);
    await applyUpdate(trx, table, before, values, requireActorOf(actor));
  });
  return read(db, loaded.trial.id, id);
}

// ---------- Reads ----------

/** Other features note their own changes in the trial's audit log the same way. */
export { writeAudit } from './record-audit-repository';

/** An observation as the API answers it: the trait's kind is read for the CSV export only. */
const withoutKind = <O extends { quantityKind: unknown }>({ quantityKind: _k, ...o }: O) => o;

/**
 * One page of a record log and where it stands in the whole list: the rows and the totals are
 * read with the same filters, so the count always matches what paging through would show.
 */
async function logPage<Row, Totals extends { total: number }>(
  db: DB,
  slug: string,
  actor: Actor | null,
  q: { page: number; limit: number; sort: LogSortKey; order?: 'asc' | 'desc' },
  read: (trialId: string, window: repo.PageWindow) => [Promise<Row[]>, Promise<Totals>],
) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  // Newest first unless asked otherwise; plots and entries from the lowest.
  const desc = q.order ? q.order === 'desc' : q.sort === 'date';
  const [rows, totals] = await Promise.all(
    read(trial.id, {
      offset: (q.page - 1) * q.limit,
      limit: q.limit,
      sort: { by: q.sort, desc },
    }),
  );
  return { rows, page: q.page, limit: q.limit, ...totals };
}

export async function listHarvests(
  db: DB,
  slug: string,
  actor: Actor | null,
  q: z.output<typeof harvestLogQuery>,
) {
  const f = { ...filters(q), grade: q.grade };
  const { rows, ...page } = await logPage(db, slug, actor, q, (trialId, window) => [
    repo.listHarvests(db, trialId, f, window),
    repo.harvestTotals(db, trialId, f),
  ]);
  return { harvests: rows, ...page };
}

export async function listObservations(
  db: DB,
  slug: string,
  actor: Actor | null,
  q: z.output<typeof observationLogQuery>,
) {
  const f = { ...filters(q), traitId: q.traitId };
  const { rows, ...page } = await logPage(db, slug, actor, q, (trialId, window) => [
    repo.listObservations(db, trialId, f, window),
    repo.observationTotals(db, trialId, f),
  ]);
  return { observations: rows.map(withoutKind), ...page };
}

export async function listFieldEvents(db: DB, slug: string, actor: Actor | null, q: Q) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  return { events: await repo.listFieldEvents(db, trial.id, filters(q)) };
}

export async function listPlots(db: DB, slug: string, actor: Actor | null, siteId?: string) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  return { plots: await repo.plotsOfTrial(db, trial.id, siteId) };
}

export async function completeness(
  db: DB,
  slug: string,
  actor: Actor | null,
  q: { siteId?: string; from: string; to: string },
) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  if (q.from > q.to) throw fieldError('query.from', 'The round starts after it ends.');
  const [plots, traits, [cells, harvests]] = await Promise.all([
    repo.plotsOfTrial(db, trial.id, q.siteId),
    repo.traitsOfTrial(db, trial.id),
    repo.completenessCounts(db, trial.id, q),
  ]);
  return {
    from: q.from,
    to: q.to,
    traits: traits.map((t) => ({ id: t.id, key: t.key, label: t.label, basis: t.basis })),
    plots,
    cells,
    harvests,
  };
}

const oneHarvest = async (db: DB, trialId: string, id: string) =>
  (await repo.listHarvests(db, trialId, { ids: [id], includeDeleted: true }))[0]!;
const oneObservation = async (db: DB, trialId: string, id: string) =>
  withoutKind((await repo.listObservations(db, trialId, { ids: [id], includeDeleted: true }))[0]!);
const oneEvent = async (db: DB, trialId: string, id: string) =>
  (await repo.listFieldEvents(db, trialId, { ids: [id], includeDeleted: true }))[0]!;

// ---------- Harvests ----------

export async function createHarvest(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: z.output<typeof createHarvestBody>,
) {
  const { trial, plot, actorName } = await trialForAction(db, slug, actor, 'records.write', {
    plotId: body.plotId,
    field: 'body.plotId',
  });
  // One statement (the record and its audit entry), so no transaction of its own.
  const { created, row } = await createOnce(
    db,
    'harvests',
    trial.id,
    {
      id: body.id,
      plot_id: body.plotId,
      harvested_on: body.harvestedOn,
      fruit_count: body.fruitCount,
      mass_g: body.massG,
      grade: body.grade,
      note: body.note,
    },
    requireActorOf(actor),
    ['plot_id'],
  );
  if (!created) return { created, record: await oneHarvest(db, trial.id, body.id) };
  // Answered from what was stored and where the plot lies: no read-back.
  const record: Harvest = {
    ...plot,
    id: row.id,
    version: row.version,
    deletedAt: null,
    createdAt: row.created_at.toISOString(),
    updatedAt: row.updated_at.toISOString(),
    createdByName: actorName,
    updatedByName: actorName,
    harvestedOn: row.harvested_on,
    fruitCount: row.fruit_count,
    massG: row.mass_g,
    grade: row.grade,
    note: row.note,
  };
  return { created, record };
}

export function updateHarvest(
  db: DB,
  slug: string,
  actor: Actor | null,
  id: string,
  body: z.output<typeof updateHarvestBody>,
) {
  const values = givenColumns({
    harvested_on: body.harvestedOn,
    fruit_count: body.fruitCount,
    mass_g: body.massG,
    grade: body.grade,
    note: body.note,
  });
  return editPlotRecord(db, slug, actor, 'harvests', id, body.version, values, oneHarvest);
}

// ---------- Observations ----------

async function traitFor(db: DB, trialId: string, traitId: string) {
  const trait = await repo.traitInTrial(db, trialId, traitId);
  if (!trait) throw fieldError('body.traitId', 'This trait is not in the trial.');
  return trait;
}

function checkValue(
  trait: Awaited<ReturnType<typeof traitFor>>,
  value: number | null,
  valueDate: string | null,
) {
  const problem = observationValueProblem(
    {
      label: trait.label,
      quantityKind: trait.quantity_kind,
      scaleMin: trait.scale_min,
      scaleMax: trait.scale_max,
    },
    value,
    valueDate,
  );
  if (problem) throw fieldError(`body.${problem.field}`, problem.message);
}

export async function createObservation(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: z.output<typeof createObservationBody>,
) {
  const loaded = await trialForAction(db, slug, actor, 'records.write');
  await writablePlot(db, loaded, actor, body.plotId);
  checkValue(await traitFor(db, loaded.trial.id, body.traitId), body.value, body.valueDate);
  const { created } = await db.transaction().execute((trx) =>
    createOnce(
      trx,
      'observations',
      loaded.trial.id,
      {
        id: body.id,
        plot_id: body.plotId,
        trait_id: body.traitId,
        observed_on: body.observedOn,
        value: body.value,
        value_date: body.valueDate,
        plant_number: body.plantNumber,
        note: body.note,
      },
      requireActorOf(actor),
      ['plot_id', 'trait_id'],
    ),
  );
  return { created, record: await oneObservation(db, loaded.trial.id, body.id) };
}

export function updateObservation(
  db: DB,
  slug: string,
  actor: Actor | null,
  id: string,
  body: z.output<typeof updateObservationBody>,
) {
  const values = givenColumns({
    observed_on: body.observedOn,
    value: body.value,
    value_date: body.valueDate,
    plant_number: body.plantNumber,
    note: body.note,
  });
  return editPlotRecord(
    db,
    slug,
    actor,
    'observations',
    id,
    body.version,
    values,
    oneObservation,
    // The value and its trait are checked together, as stored after the edit.
    async (trx, loaded, before) => {
      const merged = { ...before, ...values };
      checkValue(
        await traitFor(trx, loaded.trial.id, before.trait_id),
        merged.value,
        merged.value_date,
      );
    },
  );
}

// ---------- Field events ----------

/** The stored columns of an event, with the depth of irrigation water computed here. */
function eventColumns(e: FieldEventInput) {
  const irrigation = e.kind === 'irrigation';
  const only = <T>(when: boolean, v: T) => (when ? v : null);
  // The contract made sure every input of the chosen method is there.
  const inputs = irrigation ? irrigationInputsOf(e) : null;
  const depth = inputs ? waterDepthMm(inputs) : null;
  const drip = irrigation && e.irrigationMethod === 'drip';
  const byLine = drip && e.dripLineFlowLPerHPerM !== null;
  return {
    occurred_on: e.occurredOn,
    note: e.note,
    irrigation_method: only(irrigation, e.irrigationMethod),
    run_time_min: only(irrigation, e.runTimeMin),
    water_depth_mm: depth,
    drip_emitter_flow_l_per_h: only(drip && !byLine, e.dripEmitterFlowLPerH),
    drip_emitter_spacing_mm: only(drip && !byLine, e.dripEmitterSpacingMm),
    drip_line_flow_l_per_h_per_m: only(byLine, e.dripLineFlowLPerHPerM),
    wetted_width_mm: only(drip, e.wettedWidthMm),
    sprinkler_rate_mm_per_h: only(
      irrigation && e.irrigationMethod === 'overhead',
      e.sprinklerRateMmPerH,
    ),
    hand_volume_l: only(irrigation && e.irrigationMethod === 'hand', e.handVolumeL),
    wetted_area_m2: only(irrigation && e.irrigationMethod === 'hand', e.wettedAreaM2),
    rain_mm: only(e.kind === 'rainfall', e.rainMm),
    amendment_kind: only(e.kind === 'fertilizer' && !e.noneApplied, e.amendmentKind),
    rate_g_per_m2: only(e.kind === 'fertilizer' && !e.noneApplied, e.rateGPerM2),
    none_applied: e.kind === 'fertilizer' && e.noneApplied,
    target_spacing_mm: only(e.kind === 'thinning', e.targetSpacingMm),
  };
}

/** Plot and site notes are open to contributors; every other event is a field record. */
const eventAction = (kind: string) => (kind === 'note' ? 'notes.write' : 'records.write');

export async function createFieldEvent(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: z.output<typeof createFieldEventBody>,
) {
  const action = eventAction(body.kind);
  const loaded = await trialForAction(db, slug, actor, action);
  const site = await repo.siteInTrial(db, loaded.trial.id, body.siteId);
  if (!site) throw fieldError('body.siteId', 'This site is not in the trial.');
  if (body.plotId) {
    const plot = await plotAt(db, loaded, body.plotId);
    if (plot.site_id !== body.siteId)
      throw fieldError('body.plotId', 'This plot is at another site.');
  }
  authorize(actor, action, loaded, body.siteId);
  const { created } = await db.transaction().execute((trx) =>
    createOnce(
      trx,
      'field_events',
      loaded.trial.id,
      {
        id: body.id,
        site_id: body.siteId,
        plot_id: body.plotId,
        kind: body.kind,
        ...eventColumns(body),
      },
      requireActorOf(actor),
      ['site_id', 'kind'],
    ),
  );
  return { created, record: await oneEvent(db, loaded.trial.id, body.id) };
}

export async function updateFieldEvent(
  db: DB,
  slug: string,
  actor: Actor | null,
  id: string,
  body: z.output<typeof updateFieldEventBody>,
) {
  const loaded = await trialForAction(db, slug, actor, 'trial.read');
  await db.transaction().execute(async (trx) => {
    const before = await lockedRecord(trx, 'field_events', loaded.trial.id, id);
    authorize(actor, eventAction(before.kind), loaded, before.site_id);
    if (before.deleted_at) throw new AppError('not_found', 'This field event was deleted.');
    const { version, ...fields } = body;
    const input: FieldEventInput = { ...fields, kind: before.kind };
    const problems = fieldEventProblems(input);
    if (problems.length) {
      const fields = problems.map((p) => ({ path: `body.${p.path}`, message: p.message }));
      throw new AppError('validation_failed', problems[0]!.message, { fields });
    }
    const values = eventColumns(input);
    if (before.version !== version) await staleVersion(trx, before, version, values);
    await applyUpdate(trx, 'field_events', before, values, requireActorOf(actor));
  });
  return oneEvent(db, loaded.trial.id, id);
}

// ---------- Delete, undo ----------

const readers = { harvests: oneHarvest, observations: oneObservation, field_events: oneEvent };

/** Any record locked for deletion or undo, once the actor may change it at its site. */
async function lockedRecordForLifecycle(
  trx: DB,
  loaded: LoadedTrial,
  actor: Actor | null,
  table: repo.RecordTable,
  id: string,
) {
  const before: repo.RecordRow = await lockedRecord(trx, table, loaded.trial.id, id);
  if ('kind' in before) {
    authorize(actor, eventAction(before.kind), loaded, before.site_id);
  } else {
    const plot = await repo.plotInTrial(trx, loaded.trial.id, before.plot_id);
    if (!plot) throw AppError.notFound('The plot');
    authorize(actor, 'records.write', loaded, plot.site_id);
  }
  return before;
}

export async function deleteRecord(
  db: DB,
  slug: string,
  actor: Actor | null,
  table: repo.RecordTable,
  id: string,
) {
  const loaded = await trialForAction(db, slug, actor, 'trial.read');
  await db.transaction().execute(async (trx) => {
    const before = await lockedRecordForLifecycle(trx, loaded, actor, table, id);
    await softDelete(trx, table, before, requireActorOf(actor));
  });
  return readers[table](db, loaded.trial.id, id);
}

/** Undo of one's own recent deletion; later, or someone else's, is the lead's to restore. */
export async function undoDelete(
  db: DB,
  slug: string,
  actor: Actor | null,
  table: repo.RecordTable,
  id: string,
) {
  const loaded = await trialForAction(db, slug, actor, 'trial.read');
  await db.transaction().execute(async (trx) => {
    const before = await lockedRecordForLifecycle(trx, loaded, actor, table, id);
    const me = requireActorOf(actor);
    if (!(await mayUndo(trx, id, me)))
      throw new AppError(
        'forbidden',
        'Undo is open for 15 minutes to the person who deleted the record. Ask the trial lead to restore it from the audit log.',
      );
    await restore(trx, table, before, me);
  });
  return readers[table](db, loaded.trial.id, id);
}

/** The lead brings back any deleted record (from the audit log). */
export async function leadRestore(
  db: DB,
  slug: string,
  actor: Actor | null,
  table: repo.RecordTable,
  id: string,
) {
  const loaded = await trialForAction(db, slug, actor, 'trial.edit');
  const row = await db.transaction().execute(async (trx) => {
    const before = await lockedRecord(trx, table, loaded.trial.id, id);
    return restore(trx, table, before, requireActorOf(actor));
  });
  return { table, recordId: id, version: row.version };
}

// ---------- Stand count ----------

export async function setStandCount(
  db: DB,
  slug: string,
  actor: Actor | null,
  plotId: string,
  body: z.output<typeof standCountBody>,
) {
  const loaded = await trialForAction(db, slug, actor, 'records.write');
  const plot = await writablePlot(db, loaded, actor, plotId, 'params.plotId');
  if (plot.plants_set !== null && body.plantsSurviving > plot.plants_set)
    throw fieldError(
      'body.plantsSurviving',
      `The plot was set with ${plot.plants_set} plants; the stand cannot be more.`,
    );
  await db.transaction().execute(async (trx) => {
    const before = await repo.plotForUpdate(trx, plotId);
    if (!before) throw AppError.notFound('The plot');
    if (before.plants_surviving === body.plantsSurviving) return;
    const after = await repo.updatePlotStand(trx, plotId, {
      plants_surviving: body.plantsSurviving,
      updated_by: requireActorOf(actor).userId,
    });
    await writeAudit(trx, {
      trialId: loaded.trial.id,
      table: 'plots',
      recordId: plotId,
      action: 'update',
      before,
      after,
      actorId: requireActorOf(actor).userId,
    });
  });
  return (await repo.plotsOfTrial(db, loaded.trial.id)).find((p) => p.plotId === plotId)!;
}

import crypto from 'node:crypto';
import { type Actor, can, canInstance } from '../../common/policy';
import {
  type copyTrialBody,
  type createTrialBody,
  type Design,
  type entryBody,
  type entryUpdateBody,
  type layoutBody,
  MAX_LAYOUT_SEED,
  type plantingBody,
  type siteBody,
  type siteUpdateBody,
  rangeMessage,
  rangeRule,
  scaleMessage,
  scaleRule,
  type traitBody,
  type TraitRuleFields,
  type traitUpdateBody,
  type TraitUpdateResponse,
  unitFitsKind,
  unitMessage,
  type updateTrialBody,
} from '../../common/contracts/design';
import { describePlan } from '../../common/incomplete-blocks';
import { gardensPerReplicate, layoutProblem, randomizeLayout } from '../../common/layout';
import { plantsPerPlot } from '../../common/planting';
import { isIncompleteDesign } from '../../common/contracts/trials';
import type { DB } from '../../db/database';
import type { TraitsTable, TrialDesign } from '../../db/schema';
import type { Selectable } from 'kysely';
import { writeAudit } from '../records/records-service';
import { differingFields } from '../records/record-changes';
import { copySheetSettings, latestPublishedVersion } from '../results/results-service';
import type { z } from 'zod';
import { newAddress, wordsOf } from '../lib/address';
import { AppError, fieldError } from '../lib/app-error';
import {
  groupAllows,
  groupForAction,
  trialFactor,
  trialForAction,
  trialHeading,
  traitView,
} from '../trials/trials-service';
import { groupForNewTrial, joinGroup, varietyForEntry } from '../varieties/varieties-service';
import * as repo from './design-repository';
import type { Conn } from './design-repository';

type Out<T extends z.ZodType> = z.output<T>;

/** Turns a unique-key refusal into a message about the field that clashed. */
async function unique<T>(work: Promise<T>, byConstraint: Record<string, [string, string]>) {
  try {
    return await work;
  } catch (err) {
    const e = err as { code?: string; constraint?: string };
    const hit = e.code === '23505' && e.constraint ? byConstraint[e.constraint] : undefined;
    if (hit)
      throw new AppError('conflict', hit[1], { fields: [{ path: hit[0], message: hit[1] }] });
    throw err;
  }
}

/* ---------- Creating and editing the trial ---------- */

/** A readable address from the title: lower-case words joined by hyphens. */
export const slugFromTitle = (title: string) => wordsOf(title, 'trial');

/** A new trial's address: the title's words and a short random tail, always. */
export const newTrialSlug = (title: string) => newAddress(title, 'trial');

export async function createTrial(
  db: DB,
  actor: Actor | null,
  body: Out<typeof createTrialBody>,
): Promise<{ id: string; slug: string }> {
  if (!actor || !canInstance(actor, 'trial.create'))
    throw new AppError('unauthenticated', 'Sign in to create a trial.');
  let leadId = actor.userId;
  if (body.leadEmail !== undefined) {
    if (!actor.isAdmin)
      throw new AppError(
        'forbidden',
        'Only an instance administrator may create a trial for someone else.',
      );
    const lead = await repo.findUserByEmail(db, body.leadEmail);
    if (!lead) throw fieldError('body.leadEmail', 'No account uses this e-mail address.');
    leadId = lead.id;
  }
  if (body.groupId !== undefined) await groupForNewTrialChosen(db, body.groupId, actor);
  return withFreshSlug(body.title, (slug) =>
    db.transaction().execute(async (trx) => {
      const trial = await repo.insertTrial(trx, {
        slug,
        title: body.title,
        crop: body.crop,
        season: body.season,
        design: body.design,
        description: body.description,
        sowing_date: body.sowingDate,
        transplant_date: body.transplantDate,
        group_id: body.groupId ?? (await groupForNewTrial(trx, leadId)),
        created_by: actor.userId,
        updated_by: actor.userId,
      });
      await repo.insertLead(trx, trial.id, leadId, actor.userId);
      if (body.groupId !== undefined) await joinGroup(trx, body.groupId, leadId);
      return trial;
    }),
  );
}

/**
 * Starting a trial in a chosen group takes `group.trial.create` there; the refusal (404 outside
 * the group, 403 for a member without the role) names the field.
 */
async function groupForNewTrialChosen(db: DB, groupId: string, actor: Actor) {
  try {
    await groupForAction(db, groupId, actor, 'group.trial.create');
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    throw new AppError(err.code, err.message, {
      fields: [{ path: 'body.groupId', message: err.message }],
    });
  }
}

/** Runs `create` with a new trial address, drawing again when two new trials drew the same. */
async function withFreshSlug<T>(title: string, create: (slug: string) => Promise<T>): Promise<T> {
  // About one chance in 900 million per draw.
  for (let attempt = 0; attempt < 5; attempt++) {
    try {
      return await create(newTrialSlug(title));
    } catch (err) {
      const e = err as { code?: string; constraint?: string };
      if (e.code === '23505' && e.constraint === 'trials_slug_key') continue;
      throw err;
    }
  }
  throw new AppError(
    'conflict',
    'Could not find a free address for this title; try another title.',
  );
}

/**
 * Next season in one step: a new trial with the entries, sites, traits and settings of this
 * one, its results-sheet settings included (no records, members, photos or results), led by
 * whoever copies it, linked back to it.
 * When this trial has a layout, the copy gets one of the same shape from a new seed.
 */
export async function copyTrial(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: Out<typeof copyTrialBody>,
): Promise<{ id: string; slug: string; sameGroup: boolean; seed: number | null }> {
  const { trial: source } = await trialForAction(db, slug, actor, 'trial.edit');
  const userId = actor!.userId;
  // The copy stays in the source's group only for someone who may start trials there.
  const sameGroup =
    source.group_id !== null &&
    (await groupAllows(db, source.group_id, actor, 'group.trial.create'));
  const hadLayout =
    (await repo.countPlots(db, source.id)) > 0 &&
    source.replicates !== null &&
    source.row_length_mm !== null &&
    source.row_spacing_mm !== null;
  return withFreshSlug(body.title, (newSlug) =>
    db.transaction().execute(async (trx) => {
      const groupId = (sameGroup && source.group_id) || (await groupForNewTrial(trx, userId));
      const copy = await repo.insertTrial(trx, {
        slug: newSlug,
        title: body.title,
        crop: source.crop,
        season: body.season,
        design: source.design,
        description: source.description,
        fertilizer_policy: source.fertilizer_policy,
        fertilizer_notes: source.fertilizer_notes,
        replicates: source.replicates,
        block_size: source.block_size,
        rows_per_plot: source.rows_per_plot,
        row_length_mm: source.row_length_mm,
        row_spacing_mm: source.row_spacing_mm,
        in_row_spacing_mm: source.in_row_spacing_mm,
        copied_from_trial_id: source.id,
        group_id: groupId,
        created_by: userId,
        updated_by: userId,
      });
      await repo.insertLead(trx, copy.id, userId, userId);
      if (sameGroup) await joinGroup(trx, groupId, userId);
      for (const part of ['entries', 'sites', 'traits'] as const)
        await repo.copyTrialParts(trx, part, source.id, copy.id, userId);
      // In another group the entries join that group's register, by name.
      if (!sameGroup)
        for (const e of await repo.entriesOf(trx, copy.id))
          await repo.updateEntryRow(trx, copy.id, e.id, {
            variety_id: await varietyForEntry(
              trx,
              { group_id: groupId, crop: source.crop },
              { varietyId: null, name: e.name, entryType: e.entry_type, seedSource: e.seed_source },
              userId,
            ),
          });
      await copySheetSettings(trx, source.id, copy.id, userId);
      if (!hadLayout) return { ...copy, sameGroup, seed: null };
      let seed = crypto.randomInt(0, MAX_LAYOUT_SEED + 1);
      if (seed === source.layout_seed) seed = (seed + 1) % (MAX_LAYOUT_SEED + 1);
      const laid = await layOutPlots(trx, { id: copy.id, design: source.design }, userId, {
        replicates: source.replicates!,
        blockSize: source.block_size,
        seed,
        rowsPerPlot: source.rows_per_plot,
        rowLengthMm: source.row_length_mm!,
        rowSpacingMm: source.row_spacing_mm!,
        // Entries without a spacing of their own were planted at the old plots' spacing.
        inRowSpacingMm: source.in_row_spacing_mm ?? (await repo.commonPlotSpacing(trx, source.id)),
        factorName: source.factor_name ?? '',
        factorLevels: source.factor_levels ?? [],
        factorArrangement: source.factor_arrangement ?? 'factorial',
      });
      return { ...copy, sameGroup, seed: laid.seed };
    }),
  );
}

export async function updateTrial(
  db: DB,
  slug: string,
  actor: Actor | null,
  body: Out<typeof updateTrialBody>,
) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.edit');
  await db.transaction().execute(async (trx) => {
    const current = await repo.lockTrial(trx, trial.id);
    if (body.design !== undefined && body.design !== current.design) {
      const plots = await repo.countPlots(trx, trial.id);
      if (plots > 0)
        throw new AppError(
          'conflict',
          `The trial already has a layout of ${plots} plots. Clear the layout before changing the design.`,
        );
    }
    if (body.status !== undefined && current.status === 'published')
      throw new AppError('conflict', 'The trial is published: unpublish its results sheet first.');
    const sowing = body.sowingDate !== undefined ? body.sowingDate : current.sowing_date;
    const transplant =
      body.transplantDate !== undefined ? body.transplantDate : current.transplant_date;
    if (sowing && transplant && transplant < sowing)
      throw fieldError('body.transplantDate', 'Transplanting comes after sowing.');
    await repo.updateTrial(trx, trial.id, {
      title: body.title,
      crop: body.crop,
      season: body.season,
      design: body.design,
      status: body.status,
      description: body.description,
      sowing_date: body.sowingDate,
      transplant_date: body.transplantDate,
      fertilizer_policy: body.fertilizerPolicy,
      fertilizer_notes: body.fertilizerNotes,
      updated_by: actor!.userId,
    });
  });
}

/* ---------- Reading the design ---------- */

function lockReason(d: Awaited<ReturnType<typeof repo.plotDependents>>): string | null {
  const parts = [
    [d.harvests, 'harvest'],
    [d.observations, 'measurement'],
    [d.plotEvents, 'plot field event'],
    [d.plotPhotos, 'plot photo'],
  ]
    .filter(([n]) => (n as number) > 0)
    .map(([n, what]) => `${n} ${what}${n === 1 ? '' : 's'}`);
  if (parts.length === 0) return null;
  return `The layout is locked: ${parts.join(', ')} already refer to its plots, so it can no longer be re-randomized or cleared.`;
}

export async function getDesign(db: DB, slug: string, actor: Actor | null): Promise<Design> {
  const { trial, access } = await trialForAction(db, slug, actor, 'trial.read');
  const [entries, sites, traits, plots, dependents] = await Promise.all([
    repo.listEntries(db, trial.id),
    repo.listSites(db, trial.id),
    repo.listTraits(db, trial.id),
    repo.listPlots(db, trial.id),
    repo.plotDependents(db, trial.id),
  ]);
  const reason = lockReason(dependents);
  const canEdit = can(actor, 'trial.edit', access);
  return {
    ...trialHeading(trial),
    register: canEdit && trial.group_id ? await repo.groupRegister(db, trial.group_id) : [],
    fertilizerPolicy: trial.fertilizer_policy,
    fertilizerNotes: trial.fertilizer_notes,
    canEdit,
    factor: trialFactor(trial),
    layout: {
      seed: trial.layout_seed,
      replicates: trial.replicates,
      rowsPerPlot: trial.rows_per_plot,
      rowLengthMm: trial.row_length_mm,
      rowSpacingMm: trial.row_spacing_mm,
      inRowSpacingMm: trial.in_row_spacing_mm,
      generatedAt: trial.layout_generated_at ? trial.layout_generated_at.toISOString() : null,
      locked: reason !== null,
      lockedReason: reason,
      blockSize: trial.block_size,
      blocks:
        isIncompleteDesign(trial.design) && plots.length > 0
          ? describePlan(
              plots.map((p) => ({
                block: `${p.site_id}:${p.block}`,
                entry: p.entry_id,
                replicate: p.replicate,
              })),
              entries.map((e) => e.id),
            )
          : null,
    },
    entries: entries.map((e) => ({
      id: e.id,
      name: e.name,
      code: e.code,
      seedSource: e.seed_source,
      seedLot: e.seed_lot,
      entryType: e.entry_type,
      daysToMaturityClaimed: e.days_to_maturity_claimed,
      inRowSpacingMm: e.in_row_spacing_mm,
      noFertilizer: e.no_fertilizer,
      notes: e.notes,
      variety:
        e.variety_id && e.variety_slug && e.variety_name
          ? { id: e.variety_id, slug: e.variety_slug, name: e.variety_name }
          : null,
    })),
    sites: sites.map((s) => ({
      id: s.id,
      name: s.name,
      region: s.region,
      soilTexture: s.soil_texture as Design['sites'][number]['soilTexture'],
      irrigationMethod: s.irrigation_method,
      notes: s.notes,
    })),
    traits: traits.map((t) => ({
      ...traitView(t),
      sortOrder: t.sort_order,
      observationCount: t.observation_count,
    })),
    plots: plots.map((p) => ({
      id: p.id,
      siteId: p.site_id,
      entryId: p.entry_id,
      block: p.block,
      position: p.position,
      plotNumber: p.plot_number,
      replicate: p.replicate,
      inRowSpacingMm: p.in_row_spacing_mm,
      rowLengthMm: p.row_length_mm,
      rowSpacingMm: p.row_spacing_mm,
      plannedPlants:
        p.row_length_mm && p.in_row_spacing_mm
          ? plantsPerPlot(p.row_length_mm, p.in_row_spacing_mm, trial.rows_per_plot)
          : null,
      plantsSet: p.plants_set,
      plantsSurviving: p.plants_surviving,
      gaps: p.gaps,
      plantedNote: p.planted_note,
      treatment: p.treatment,
    })),
  };
}

/* ---------- Entries, sites and traits ---------- */

/** Adding or removing entries or sites would leave the layout incomplete. */
async function assertNoLayout(trx: Conn, trialId: string, change: string) {
  const plots = await repo.countPlots(trx, trialId);
  if (plots === 0) return;
  const reason = lockReason(await repo.plotDependents(trx, trialId));
  throw new AppError(
    'conflict',
    reason
      ? `${reason} ${change} is no longer possible.`
      : `The trial already has a layout of ${plots} plots. Clear the layout on the Layout page first, then ${change.toLowerCase()} and generate it again.`,
  );
}

async function editing(db: DB, slug: string, actor: Actor | null) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.edit');
  return { trialId: trial.id, userId: actor!.userId };
}

/** Adds an entry or site while the trial has no layout (the layout is made from them). */
function insertBeforeLayout<P extends 'entries' | 'sites'>(
  db: DB,
  trialId: string,
  table: P,
  change: string,
  values: Parameters<typeof repo.insertPart<P>>[2],
  byConstraint: Record<string, [string, string]>,
) {
  return db.transaction().execute(async (trx) => {
    await repo.lockTrial(trx, trialId);
    await assertNoLayout(trx, trialId, change);
    return unique(repo.insertPart(trx, table, values), byConstraint);
  });
}

/** Removes an entry or site while the trial has no layout; `what` names it in a 404. */
async function deleteBeforeLayout(
  db: DB,
  slug: string,
  actor: Actor | null,
  table: 'entries' | 'sites',
  id: string,
  what: string,
  change: string,
) {
  const { trialId } = await editing(db, slug, actor);
  await db.transaction().execute(async (trx) => {
    await repo.lockTrial(trx, trialId);
    if (!(await repo.findPart(trx, table, trialId, id))) throw AppError.notFound(what);
    await assertNoLayout(trx, trialId, change);
    await repo.deletePart(trx, table, trialId, id);
  });
}

/**
 * Body fields under their column names. On a patch a field left out stays undefined, which the
 * update leaves unchanged.
 */
function columns<const M extends Record<string, string>, B extends { [K in keyof M]?: unknown }>(
  names: M,
  body: B,
) {
  return Object.fromEntries(
    Object.entries(names).map(([field, column]) => [column, body[field]]),
  ) as { [K in keyof M as M[K]]: B[K] };
}

const entryColumnNames = {
  name: 'name',
  code: 'code',
  seedSource: 'seed_source',
  seedLot: 'seed_lot',
  entryType: 'entry_type',
  daysToMaturityClaimed: 'days_to_maturity_claimed',
  inRowSpacingMm: 'in_row_spacing_mm',
  noFertilizer: 'no_fertilizer',
  notes: 'notes',
} as const;

const siteColumnNames = {
  name: 'name',
  region: 'region',
  soilTexture: 'soil_texture',
  irrigationMethod: 'irrigation_method',
  notes: 'notes',
} as const;

const entryUnique = {
  entries_trial_id_code_key: ['body.code', 'Another entry of this trial already uses this code.'],
  entries_trial_id_name_key: ['body.name', 'Another entry of this trial already has this name.'],
} satisfies Record<string, [string, string]>;

export async function createEntry(
  db: DB,
  slug: string,
  actor: Actor | null,
  b: Out<typeof entryBody>,
) {
  const { trial } = await trialForAction(db, slug, actor, 'trial.edit');
  const userId = actor!.userId;
  const { varietyId, ...fields } = b;
  return db.transaction().execute(async (trx) => {
    await repo.lockTrial(trx, trial.id);
    await assertNoLayout(trx, trial.id, 'Adding an entry');
    const variety = await varietyForEntry(trx, trial, { ...b, varietyId }, userId);
    return unique(
      repo.insertPart(trx, 'entries', {
        trial_id: trial.id,
        ...columns(entryColumnNames, fields),
        variety_id: variety,
        created_by: userId,
        updated_by: userId,
      }),
      entryUnique,
    );
  });
}

export async function updateEntry(
  db: DB,
  slug: string,
  actor: Actor | null,
  entryId: string,
  b: Out<typeof entryUpdateBody>,
) {
  const { trialId, userId } = await editing(db, slug, actor);
  const { varietyId, ...fields } = b;
  await db.transaction().execute(async (trx) => {
    const trial = await repo.lockTrial(trx, trialId);
    const row = await unique(
      repo.updateEntryRow(trx, trialId, entryId, {
        ...columns(entryColumnNames, fields),
        updated_by: userId,
      }),
      entryUnique,
    );
    if (!row) throw AppError.notFound('The entry');
    if (varietyId !== undefined) {
      const entry = await repo.findEntry(trx, trialId, entryId);
      const variety = await varietyForEntry(
        trx,
        trial,
        {
          varietyId,
          name: entry.name,
          entryType: entry.entry_type,
          seedSource: entry.seed_source,
        },
        userId,
      );
      await repo.updateEntryRow(trx, trialId, entryId, { variety_id: variety });
    }
    // Before planting the plan follows the entry's spacing; afterwards plots keep what was planted.
    if (b.inRowSpacingMm != null && lockReason(await repo.plotDependents(trx, trialId)) === null)
      await repo.setEntryPlotSpacing(trx, trialId, entryId, b.inRowSpacingMm);
  });
}

export function deleteEntry(db: DB, slug: string, actor: Actor | null, entryId: string) {
  return deleteBeforeLayout(db, slug, actor, 'entries', entryId, 'The entry', 'Removing an entry');
}

const siteUnique = {
  sites_trial_id_name_key: ['body.name', 'Another site of this trial already has this name.'],
} satisfies Record<string, [string, string]>;

export async function createSite(
  db: DB,
  slug: string,
  actor: Actor | null,
  b: Out<typeof siteBody>,
) {
  const { trialId, userId } = await editing(db, slug, actor);
  return insertBeforeLayout(
    db,
    trialId,
    'sites',
    'Adding a site',
    { trial_id: trialId, ...columns(siteColumnNames, b), created_by: userId, updated_by: userId },
    siteUnique,
  );
}

export async function updateSite(
  db: DB,
  slug: string,
  actor: Actor | null,
  siteId: string,
  b: Out<typeof siteUpdateBody>,
) {
  const { trialId, userId } = await editing(db, slug, actor);
  const row = await unique(
    repo.updateSiteRow(db, trialId, siteId, {
      ...columns(siteColumnNames, b),
      updated_by: userId,
    }),
    siteUnique,
  );
  if (!row) throw AppError.notFound('The site');
}

export function deleteSite(db: DB, slug: string, actor: Actor | null, siteId: string) {
  return deleteBeforeLayout(db, slug, actor, 'sites', siteId, 'The site', 'Removing a site');
}

const traitUnique = {
  traits_trial_id_key_key: ['body.key', 'This trial already records a trait with this key.'],
} satisfies Record<string, [string, string]>;

export async function createTrait(
  db: DB,
  slug: string,
  actor: Actor | null,
  b: Out<typeof traitBody>,
) {
  const { trialId, userId } = await editing(db, slug, actor);
  return db.transaction().execute(async (trx) => {
    await repo.lockTrial(trx, trialId);
    const sortOrder = b.sortOrder ?? (await repo.maxTraitOrder(trx, trialId)) + 1;
    return unique(
      repo.insertPart(trx, 'traits', {
        trial_id: trialId,
        key: b.key,
        label: b.label,
        quantity_kind: b.quantityKind,
        basis: b.basis,
        direction: b.direction,
        scale_min: b.scaleMin,
        scale_max: b.scaleMax,
        display_unit: b.displayUnit,
        plausible_min: b.plausibleMin,
        plausible_max: b.plausibleMax,
        sort_order: sortOrder,
        created_by: userId,
        updated_by: userId,
      }),
      traitUnique,
    );
  });
}

/** What a stored trait looks like to the contract's rules. */
const ruleFields = (t: Selectable<TraitsTable>): TraitRuleFields => ({
  quantityKind: t.quantity_kind,
  scaleMin: t.scale_min,
  scaleMax: t.scale_max,
  displayUnit: t.display_unit,
  plausibleMin: t.plausible_min,
  plausibleMax: t.plausible_max,
});

/** Settings a published sheet shows: changing one means the next version will differ. */
/** What a published sheet shows of a trait, as `differingFields` names the columns. */
const publishedSettings = ['key', 'label', 'basis', 'direction', 'displayUnit'] as const;

/**
 * Edits a trait. Its name, unit, direction and plausible range can always change (the
 * records are stored in SI units, so a unit changes only what people read and type); its key,
 * kind and scale only before any measurement uses it, and its basis only between per plant
 * and per plot once measurements exist. The audit log keeps the trait as it was; published
 * versions keep showing the old trait until the lead publishes a new one.
 */
export async function updateTrait(
  db: DB,
  slug: string,
  actor: Actor | null,
  traitId: string,
  b: Out<typeof traitUpdateBody>,
): Promise<TraitUpdateResponse> {
  const { trialId, userId } = await editing(db, slug, actor);
  return db.transaction().execute(async (trx) => {
    const before = await repo.lockTrait(trx, trialId, traitId);
    if (!before) throw AppError.notFound('The trait');
    const kind = b.quantityKind ?? before.quantity_kind;
    // a kind without a scale or unit clears the old one with the kind
    const scaled = kind === 'score';
    const rangeless = b.quantityKind !== undefined && (scaled || kind === 'date');
    const values = {
      key: b.key,
      label: b.label,
      quantity_kind: b.quantityKind,
      basis: b.basis,
      direction: b.direction,
      scale_min: b.quantityKind && !scaled ? null : b.scaleMin,
      scale_max: b.quantityKind && !scaled ? null : b.scaleMax,
      display_unit:
        b.quantityKind && b.quantityKind !== before.quantity_kind && b.displayUnit === undefined
          ? null
          : b.displayUnit,
      plausible_min: b.plausibleMin !== undefined ? b.plausibleMin : rangeless ? null : undefined,
      plausible_max: b.plausibleMax !== undefined ? b.plausibleMax : rangeless ? null : undefined,
      sort_order: b.sortOrder,
    };
    const merged = { ...ruleFields(before), ...definedOnly(ruleFieldsOfBody(values)) };
    for (const [rule, { path, message }] of [
      [scaleRule, scaleMessage],
      [unitFitsKind, unitMessage],
      [rangeRule, rangeMessage],
    ] as const) {
      if (!rule(merged)) throw fieldError(`body.${path[0]}`, message);
    }

    const n = await repo.countTraitObservations(trx, traitId);
    if (n > 0) {
      const locked = (['key', 'quantity_kind', 'scale_min', 'scale_max'] as const).filter(
        (c) => values[c] !== undefined && values[c] !== before[c],
      );
      if (locked.length)
        throw new AppError(
          'conflict',
          `${n} measurements already use this trait: its key, kind and scale can no longer change (its name, unit, direction, basis and plausible range still can).`,
        );
      if (values.basis === 'harvest' && before.basis !== 'harvest')
        throw new AppError(
          'conflict',
          `${n} measurements already use this trait: it cannot switch to harvest records.`,
        );
    }
    const stored = await unique(
      repo.updateTraitRow(trx, trialId, traitId, { ...values, updated_by: userId }),
      traitUnique,
    );
    if (!stored) throw AppError.notFound('The trait');
    if (stored.key !== before.key)
      await repo.renameSheetTraitKey(trx, trialId, before.key, stored.key);
    const changed = differingFields(before, stored);
    if (changed.length)
      await writeAudit(trx, {
        trialId,
        table: 'traits',
        recordId: traitId,
        action: 'update',
        before,
        after: stored,
        actorId: userId,
      });
    const published = await latestPublishedVersion(trx, trialId);
    return {
      publishedVersion: published || null,
      altersPublished: published > 0 && publishedSettings.some((c) => changed.includes(c)),
    };
  });
}

const ruleFieldsOfBody = (v: {
  quantity_kind?: string | undefined;
  scale_min?: number | null | undefined;
  scale_max?: number | null | undefined;
  display_unit?: string | null | undefined;
  plausible_min?: number | null | undefined;
  plausible_max?: number | null | undefined;
}): TraitRuleFields => ({
  quantityKind: v.quantity_kind,
  scaleMin: v.scale_min,
  scaleMax: v.scale_max,
  displayUnit: v.display_unit,
  plausibleMin: v.plausible_min,
  plausibleMax: v.plausible_max,
});

const definedOnly = <T extends object>(o: T): Partial<T> =>
  Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;

export async function deleteTrait(db: DB, slug: string, actor: Actor | null, traitId: string) {
  const { trialId } = await editing(db, slug, actor);
  await db.transaction().execute(async (trx) => {
    if (!(await repo.findPart(trx, 'traits', trialId, traitId)))
      throw AppError.notFound('The trait');
    const n = await repo.countTraitObservations(trx, traitId);
    if (n > 0)
      throw new AppError(
        'conflict',
        `${n} measurements use this trait; it cannot be removed without losing them.`,
      );
    await repo.deletePart(trx, 'traits', trialId, traitId);
  });
}

/* ---------- The layout ---------- */

async function assertLayoutOpen(trx: Conn, trialId: string) {
  const reason = lockReason(await repo.plotDependents(trx, trialId));
  if (reason) throw new AppError('conflict', reason);
}

/** Randomizes the plots of a locked trial (the caller holds the transaction and the lock). */
async function layOutPlots(
  trx: Conn,
  trial: { id: string; design: TrialDesign },
  userId: string,
  b: Out<typeof layoutBody>,
): Promise<{ seed: number; plots: number }> {
  const trialId = trial.id;
  const [entries, sites] = await Promise.all([
    repo.listEntries(trx, trialId),
    repo.listSites(trx, trialId),
  ]);
  const incomplete = isIncompleteDesign(trial.design);
  const factor =
    b.factorLevels.length > 0
      ? { name: b.factorName, levels: b.factorLevels, arrangement: b.factorArrangement }
      : null;
  const seed = b.seed ?? crypto.randomInt(0, MAX_LAYOUT_SEED + 1);
  const plan = {
    factor,
    design: trial.design,
    // Sorted by code and name, so the same seed gives the same plan in any copy of the trial.
    entryIds: entries.map((e) => e.id),
    replicates: b.replicates,
    siteIds: sites.map((s) => s.id),
    seed,
    ...(incomplete ? { blockSize: b.blockSize } : {}),
  };
  const problem = layoutProblem(plan);
  if (problem)
    throw problem.field
      ? fieldError(`body.${problem.field}`, problem.message)
      : new AppError('unprocessable', problem.message);
  const unspaced = entries.filter((e) => e.in_row_spacing_mm == null).map((e) => e.code);
  if (unspaced.length > 0 && b.inRowSpacingMm == null)
    throw fieldError(
      'body.inRowSpacingMm',
      `Give an in-row spacing for the entries without their own (${unspaced.join(', ')}).`,
    );
  let planned;
  try {
    planned = randomizeLayout(plan);
  } catch (err) {
    // Anything the plan itself refuses beyond the checks above is said as it is.
    throw new AppError('unprocessable', (err as Error).message);
  }
  // A network's replicates follow from its gardens: store the full ones.
  const replicates =
    trial.design === 'network'
      ? Math.floor(sites.length / gardensPerReplicate(entries.length, b.blockSize!))
      : b.replicates;
  const spacing = new Map(entries.map((e) => [e.id, e.in_row_spacing_mm ?? b.inRowSpacingMm!]));
  await repo.deletePlots(trx, trialId);
  await repo.insertPlots(
    trx,
    planned.map((p) => ({
      trial_id: trialId,
      site_id: p.siteId,
      entry_id: p.entryId,
      block: p.block,
      position: p.position,
      plot_number: p.plotNumber,
      treatment: p.treatment,
      replicate: p.replicate ?? null,
      in_row_spacing_mm: spacing.get(p.entryId)!,
      row_length_mm: b.rowLengthMm,
      row_spacing_mm: b.rowSpacingMm,
      created_by: userId,
      updated_by: userId,
    })),
  );
  await repo.updateTrial(trx, trialId, {
    layout_seed: seed,
    replicates,
    block_size: incomplete ? b.blockSize : null,
    rows_per_plot: b.rowsPerPlot,
    row_length_mm: b.rowLengthMm,
    row_spacing_mm: b.rowSpacingMm,
    in_row_spacing_mm: b.inRowSpacingMm,
    factor_name: factor?.name ?? null,
    factor_levels: factor?.levels ?? null,
    factor_arrangement: factor?.arrangement ?? null,
    layout_generated_at: new Date(),
    updated_by: userId,
  });
  return { seed, plots: planned.length };
}

export async function generateLayout(
  db: DB,
  slug: string,
  actor: Actor | null,
  b: Out<typeof layoutBody>,
): Promise<{ seed: number; plots: number }> {
  const { trialId, userId } = await editing(db, slug, actor);
  return db.transaction().execute(async (trx) => {
    const trial = await repo.lockTrial(trx, trialId);
    await assertLayoutOpen(trx, trialId);
    return layOutPlots(trx, trial, userId, b);
  });
}

export async function clearLayout(db: DB, slug: string, actor: Actor | null) {
  const { trialId, userId } = await editing(db, slug, actor);
  await db.transaction().execute(async (trx) => {
    await repo.lockTrial(trx, trialId);
    await assertLayoutOpen(trx, trialId);
    await repo.deletePlots(trx, trialId);
    await repo.updateTrial(trx, trialId, {
      layout_seed: null,
      layout_generated_at: null,
      updated_by: userId,
    });
  });
}

export async function recordPlanting(
  db: DB,
  slug: string,
  actor: Actor | null,
  b: Out<typeof plantingBody>,
): Promise<{ updated: number }> {
  const { trialId, userId } = await editing(db, slug, actor);
  const ids = new Set<string>();
  b.plots.forEach((p, i) => {
    if (ids.has(p.plotId)) throw fieldError(`body.plots.${i}.plotId`, 'This plot is listed twice.');
    ids.add(p.plotId);
  });
  return db.transaction().execute(async (trx) => {
    for (const [i, p] of b.plots.entries()) {
      const row = await repo.updatePlanting(trx, trialId, p.plotId, {
        plants_set: p.plantsSet,
        plants_surviving: p.plantsSurviving,
        gaps: p.gaps,
        planted_note: p.note,
        updated_by: userId,
      });
      // Throwing here rolls back every plot of the request: all or nothing.
      if (!row) throw fieldError(`body.plots.${i}.plotId`, 'This plot is not part of the trial.');
    }
    return { updated: b.plots.length };
  });
}

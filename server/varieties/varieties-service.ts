import type { z } from 'zod';
import type {
  Comparison,
  compareQuery,
  createVarietyBody,
  Environment,
  GroupList,
  Stability,
  stabilityQuery,
  updateVarietyBody,
  VarietyList,
  VarietyRecord,
  VarietyTrial,
} from '../../common/contracts/varieties';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import {
  balancedSubset,
  type EnvironmentMean,
  StabilityInputError,
  type StabilityResult,
  stabilityAnalysis,
} from '../analysis/engine/stability';
import { AppError } from '../lib/app-error';
import { maySeePhoto } from '../photos/photos-service';
import { newAddress } from '../lib/address';
import { groupForAction, groupStanding, groupStandingOf } from '../trials/trials-service';
import {
  type Analyse,
  readTrial,
  siteMeans,
  type TrialFigures,
  type TrialReading,
} from './variety-figures';
import * as repo from './varieties-repository';

type Out<T extends z.ZodType> = z.output<T>;

export async function listGroups(db: DB, actor: Actor | null): Promise<GroupList> {
  if (!actor) throw new AppError('unauthenticated', 'Sign in to see your groups.');
  const rows = await repo.groupsOf(db, actor.userId);
  return { groups: rows.map((g) => ({ id: g.id, slug: g.slug, name: g.name, myRole: g.role })) };
}

/** The registers of the caller's groups (an administrator sees every group's). */
export async function listVarieties(db: DB, actor: Actor | null): Promise<VarietyList> {
  if (!actor) throw new AppError('unauthenticated', 'Sign in to see your groups’ registers.');
  const groupIds = actor.isAdmin
    ? ('all' as const)
    : (await repo.groupsOf(db, actor.userId)).map((g) => g.id);
  const rows = await repo.listVarieties(db, groupIds, actor.userId);
  return {
    varieties: rows.map((v) => ({
      id: v.id,
      slug: v.slug,
      name: v.name,
      crop: v.crop,
      type: v.variety_type,
      aliases: v.aliases,
      groupId: v.group_id,
      trialCount: v.trial_count,
      seasonCount: v.season_count,
      // Only a cover the caller may open, as the photo routes decide it.
      cover:
        v.cover_id && v.cover_trial_slug && coverVisible(actor, v)
          ? photoUrls(`/api/trials/${v.cover_trial_slug}/photos/${v.cover_id}`, v.cover_id)
          : null,
    })),
  };
}

/** Whether the caller may open a listed variety's cover (its photo, trial and membership read with it). */
function coverVisible(actor: Actor, v: Awaited<ReturnType<typeof repo.listVarieties>>[number]) {
  if (!v.cover_trial_status) return false;
  return maySeePhoto(
    actor,
    {
      status: v.cover_trial_status,
      member_role: v.member_role,
      member_site_ids: v.member_site_ids,
    },
    // The list joins only a kept photo as the cover (see `listVarieties`).
    { is_cover: v.cover_is_sheet_cover ?? false, deleted_at: null },
  );
}

/** A photo's sizes, as the photo routes serve them under `base`. */
function photoUrls(base: string, id: string) {
  return { id, thumbUrl: `${base}/thumb`, displayUrl: `${base}/display` };
}

/** A unique-name clash in a register, as a refusal on the name field. */
async function uniqueName<T>(work: Promise<T>): Promise<T> {
  try {
    return await work;
  } catch (err) {
    const e = err as { code?: string; constraint?: string };
    if (e.code === '23505' && e.constraint === 'varieties_group_id_name_key') {
      const message = 'The register already has a variety of this name.';
      throw new AppError('conflict', message, { fields: [{ path: 'body.name', message }] });
    }
    throw err;
  }
}

export async function createVariety(
  db: DB,
  actor: Actor | null,
  b: Out<typeof createVarietyBody>,
): Promise<{ slug: string }> {
  await groupForAction(db, b.groupId, actor, 'register.edit');
  return uniqueName(
    repo.insertVariety(db, {
      ...varietyColumns(b),
      name: b.name,
      crop: b.crop,
      group_id: b.groupId,
      slug: newAddress(b.name, 'variety'),
      created_by: actor!.userId,
      updated_by: actor!.userId,
    }),
  );
}

/** The body's fields under their column names (a field left out of an edit stays undefined). */
function varietyColumns(b: Partial<Out<typeof updateVarietyBody>>) {
  return {
    name: b.name,
    crop: b.crop,
    variety_type: b.type,
    origin: b.origin,
    seed_source: b.seedSource,
    description: b.description,
    expected_traits: b.expectedTraits,
    aliases: b.aliases,
  };
}

/**
 * The variety by its address (404 if there is none) and the caller's standing in its group. The
 * caller may see it if it is in one of their groups' registers, or grown in a trial whose figures
 * they may see (its members; anyone once its results are published): the page decides the
 * second, from the trials it reads, and answers 404 when neither holds.
 */
async function visibleVariety(db: DB, actor: Actor | null, slug: string) {
  const variety = await repo.findVarietyBySlug(db, slug);
  if (!variety) throw AppError.notFound('The variety');
  return { variety, ...(await groupStanding(db, variety.group_id, actor)) };
}

export async function updateVariety(
  db: DB,
  actor: Actor | null,
  slug: string,
  b: Out<typeof updateVarietyBody>,
): Promise<void> {
  const variety = await repo.findVarietyBySlug(db, slug);
  if (!variety) throw AppError.notFound('The variety');
  await groupForAction(db, variety.group_id, actor, 'register.edit');
  if (b.coverPhotoId) {
    const photo = await repo.photoOfVariety(
      db,
      { id: variety.id, groupId: variety.group_id },
      b.coverPhotoId,
    );
    if (!photo) {
      const message = 'Choose a photo of this variety from one of its group’s trials.';
      throw new AppError('validation_failed', message, {
        fields: [{ path: 'body.coverPhotoId', message }],
      });
    }
  }
  await uniqueName(
    repo.updateVariety(db, variety.id, {
      ...varietyColumns(b),
      cover_photo_id: b.coverPhotoId,
      updated_by: actor!.userId,
    }),
  );
}

type ReadingOf = (trial: Trial) => Promise<TrialReading | null>;

/** Each trial once per request, keyed by its id, however many of the chosen varieties it grew. */
function oncePerTrial<T>(read: (trial: Trial) => Promise<T>) {
  const cache = new Map<string, Promise<T>>();
  return (trial: Trial) => {
    let f = cache.get(trial.id);
    if (!f) {
      f = read(trial);
      cache.set(trial.id, f);
    }
    return f;
  };
}

/** Each trial read once per request, whichever traits are then analysed of it. */
const readingsOnce = (db: DB, actor: Actor | null): ReadingOf =>
  oncePerTrial((trial) => readTrial(db, actor, trial));

/** Each trial's figures for the traits chosen, analysed once from its one reading. */
const figuresOnce = (readingOf: ReadingOf, analyse: Analyse) =>
  oncePerTrial(async (trial): Promise<TrialFigures | null> => {
    const reading = await readingOf(trial);
    return reading && { ...reading, ...(await reading.analyse(analyse)) };
  });

export async function varietyRecord(
  db: DB,
  actor: Actor | null,
  slug: string,
): Promise<VarietyRecord> {
  const { variety, allows } = await visibleVariety(db, actor, slug);
  const figuresOf = figuresOnce(readingsOnce(db, actor), 'all');
  const trials: VarietyTrial[] = [];
  const photos: VarietyRecord['photos'] = [];
  for (const { entry, trial } of await repo.entriesOfVarieties(db, [variety.id])) {
    const f = await figuresOf(trial);
    if (!f) continue;
    // The published version knows the entry by the name it had when published.
    const name = f.entryNames.get(entry.id);
    if (name === undefined) continue;
    const sheetEntry = f.snapshot?.entries.find((e) => e.id === entry.id);
    trials.push({
      slug: trial.slug,
      title: f.snapshot?.trial.title ?? trial.title,
      season: f.snapshot?.trial.season ?? trial.season,
      view: f.view,
      version: f.version,
      entry: {
        name,
        code: sheetEntry?.code ?? entry.code,
        notes: f.view === 'trial' ? entry.notes : (sheetEntry?.note ?? ''),
      },
      sites: f.snapshot
        ? f.snapshot.sites.map((s) => ({ name: s.name, region: s.region }))
        : await repo.trialSites(db, trial.id),
      traits: f.figures.map((fig) => {
        const m = fig.means.get(name);
        return {
          key: fig.key,
          label: fig.label,
          unit: fig.unit,
          direction: fig.direction,
          decimals: fig.decimals,
          mean: m?.mean ?? null,
          rank: m?.rank ?? null,
          entryCount: fig.means.size,
          group: m?.group ?? '',
          sites: siteMeans(fig, name),
        };
      }),
      warnings: f.warnings,
    });
    if (f.view === 'trial') {
      const kept = await repo.entryPhotos(db, trial.id, entry.id, 6, variety.cover_photo_id);
      for (const p of kept)
        photos.push({
          ...photoUrls(`/api/trials/${trial.slug}/photos/${p.id}`, p.id),
          caption: p.caption,
          trialSlug: trial.slug,
          season: trial.season,
        });
    } else if (sheetEntry?.photo) {
      const { id, caption } = sheetEntry.photo;
      photos.push({
        ...photoUrls(`/api/results/${trial.slug}/v/${f.version}/photos/${id}`, id),
        caption,
        trialSlug: trial.slug,
        season: f.snapshot!.trial.season,
      });
    }
  }
  if (!allows('register.read') && trials.length === 0) throw AppError.notFound('The variety');
  // The cover only where this page already shows that photo to the caller (live or published).
  const cover = photos.find((p) => p.id === variety.cover_photo_id);
  return {
    variety: {
      id: variety.id,
      slug: variety.slug,
      name: variety.name,
      crop: variety.crop,
      type: variety.variety_type,
      origin: variety.origin,
      seedSource: variety.seed_source,
      description: variety.description,
      expectedTraits: variety.expected_traits,
      aliases: variety.aliases,
      group: { id: variety.group_id, slug: variety.group_slug, name: variety.group_name },
      cover: cover
        ? { id: cover.id, thumbUrl: cover.thumbUrl, displayUrl: cover.displayUrl }
        : null,
    },
    canEdit: allows('register.edit'),
    trials,
    photos,
  };
}

/**
 * Chosen varieties side by side on one trait, one column per trial and site. Pairs of
 * varieties are only compared over the environments they shared; a pair that shared none
 * says so and carries no difference.
 */
export async function compareVarieties(
  db: DB,
  actor: Actor | null,
  q: Out<typeof compareQuery>,
): Promise<Comparison> {
  const found = await repo.findVarietiesBySlugs(db, q.varieties);
  const chosen = [];
  for (const slug of q.varieties) {
    const v = found.find((f) => f.slug === slug);
    if (!v) throw AppError.notFound(`The variety "${slug}"`);
    chosen.push(v);
  }
  const entries = await repo.entriesOfVarieties(
    db,
    chosen.map((v) => v.id),
  );
  // Each trial is read once: first to list its traits, then to analyse the one chosen.
  const readingOf = readingsOnce(db, actor);
  const { traitLabels, visibleTrials } = await visibleTraits(readingOf, entries);
  // A variety is compared only when the caller may see it (group member or a visible trial).
  const myGroups = actor ? await repo.groupsOf(db, actor.userId) : [];
  for (const v of chosen) {
    const role = myGroups.find((g) => g.id === v.group_id)?.role ?? null;
    const grownVisibly = entries.some(
      (e) => e.entry.varietyId === v.id && visibleTrials.has(e.trial.id),
    );
    if (!groupStandingOf(actor, role).allows('register.read') && !grownVisibly)
      throw AppError.notFound(`The variety "${v.slug}"`);
  }
  const traits = [...traitLabels].map(([key, label]) => ({ key, label }));
  const traitKey = chosenTraitKey(traitLabels, q.trait);
  const { trait, columns, cells } = await environmentMeans(
    readingOf,
    entries,
    visibleTrials,
    traitKey,
  );
  const trialsOf = (varietyId: string) =>
    new Set(
      entries
        .filter((e) => e.entry.varietyId === varietyId && visibleTrials.has(e.trial.id))
        .map((e) => e.trial.id),
    );
  const pairs: Comparison['pairs'] = [];
  for (let i = 0; i < chosen.length; i++)
    for (let j = i + 1; j < chosen.length; j++) {
      const a = chosen[i]!;
      const b = chosen[j]!;
      const inB = trialsOf(b.id);
      const shared = [...trialsOf(a.id)].filter((t) => inB.has(t)).length;
      const diffs: number[] = [];
      for (const [col, mean] of cells.get(a.id) ?? []) {
        const other = cells.get(b.id)?.get(col);
        if (other !== undefined) diffs.push(mean - other);
      }
      pairs.push({
        a: a.slug,
        b: b.slug,
        sharedTrials: shared,
        sharedEnvironments: diffs.length,
        difference: diffs.length ? diffs.reduce((s, d) => s + d, 0) / diffs.length : null,
      });
    }
  return {
    varieties: chosen.map((v) => ({ slug: v.slug, name: v.name })),
    traits,
    trait,
    columns,
    rows: chosen.map((v) => ({
      slug: v.slug,
      means: columns.map((_, i) => cells.get(v.id)?.get(i) ?? null),
    })),
    pairs,
  };
}

type VarietyEntries = Awaited<ReturnType<typeof repo.entriesOfVarieties>>;

/** Every trait of every trial (of these entries) whose figures the caller may see. */
async function visibleTraits(readingOf: ReadingOf, entries: VarietyEntries) {
  const traitLabels = new Map<string, string>();
  const visibleTrials = new Set<string>();
  for (const { trial } of entries) {
    const f = await readingOf(trial);
    if (!f) continue;
    visibleTrials.add(trial.id);
    for (const t of f.traits) if (!traitLabels.has(t.key)) traitLabels.set(t.key, t.label);
  }
  return { traitLabels, visibleTrials };
}

/** The trait asked for (refused when no visible trial measured it), else the first listed. */
function chosenTraitKey(traitLabels: Map<string, string>, asked: string | undefined) {
  if (asked !== undefined && !traitLabels.has(asked))
    throw new AppError(
      'validation_failed',
      'None of these varieties’ trials measured this trait.',
      {
        fields: [
          { path: 'query.trait', message: 'Choose a trait these varieties were measured on.' },
        ],
      },
    );
  return asked ?? traitLabels.keys().next().value;
}

/**
 * Each entry's mean of one trait at each site of each visible trial: one column per trial and
 * site (an environment), oldest season first; `cells` by variety id, then column.
 */
async function environmentMeans(
  readingOf: ReadingOf,
  entries: VarietyEntries,
  visibleTrials: Set<string>,
  traitKey: string | undefined,
) {
  const columns: Environment[] = [];
  const cells = new Map<string, Map<number, number>>();
  let trait: Comparison['trait'] = null;
  if (traitKey === undefined) return { trait, columns, cells };
  const figuresOf = figuresOnce(readingOf, { trait: traitKey });
  const columnIndex = new Map<string, number>();
  for (const { entry, trial: row } of entries) {
    if (!visibleTrials.has(row.id)) continue;
    const f = await figuresOf(row);
    const fig = f?.figures[0];
    if (!f || !fig) continue;
    trait ??= {
      key: fig.key,
      label: fig.label,
      unit: fig.unit,
      direction: fig.direction,
      decimals: fig.decimals,
    };
    const name = f.entryNames.get(entry.id);
    if (name === undefined) continue;
    for (const s of siteMeans(fig, name)) {
      const key = `${row.id}\u0000${s.site}`;
      let i = columnIndex.get(key);
      if (i === undefined) {
        i = columns.length;
        columnIndex.set(key, i);
        columns.push({
          trialSlug: row.slug,
          trialTitle: f.snapshot?.trial.title ?? row.title,
          season: f.snapshot?.trial.season ?? row.season,
          site: s.site,
        });
      }
      let mine = cells.get(entry.varietyId);
      if (!mine) cells.set(entry.varietyId, (mine = new Map()));
      mine.set(i, s.mean);
    }
  }
  return { trait, columns, cells };
}

/**
 * Stability of a crop's register varieties across environments (each trial × site), on one
 * trait: the environment index, each variety's regression on it, deviation mean square and
 * ecovalence, computed on the largest balanced subset; what was left out says why.
 */
export async function varietyStability(
  db: DB,
  actor: Actor | null,
  q: Out<typeof stabilityQuery>,
): Promise<Stability> {
  const { group } = await groupForAction(db, q.group, actor, 'register.read');
  const register = await repo.registerVarieties(db, group.id);
  const crops = [...new Set(register.map((v) => v.crop))].sort();
  const ofCrop = register.filter((v) => v.crop.toLowerCase() === q.crop.toLowerCase());
  if (ofCrop.length === 0)
    throw new AppError('validation_failed', 'The register has no variety of this crop.', {
      fields: [{ path: 'query.crop', message: 'Choose a crop of the register.' }],
    });
  const entries = await repo.entriesOfVarieties(
    db,
    ofCrop.map((v) => v.id),
  );
  // Each trial is read once: first to list its traits, then to analyse the one chosen.
  const readingOf = readingsOnce(db, actor);
  const { traitLabels, visibleTrials } = await visibleTraits(readingOf, entries);
  const traitKey = chosenTraitKey(traitLabels, q.trait);
  const { trait, columns, cells } = await environmentMeans(
    readingOf,
    entries,
    visibleTrials,
    traitKey,
  );
  const input: EnvironmentMean[] = ofCrop.flatMap((v) =>
    [...(cells.get(v.id) ?? [])].map(([col, mean]) => ({
      variety: v.slug,
      environment: String(col),
      mean,
    })),
  );
  let result: StabilityResult | null = null;
  let notice: string | null = null;
  try {
    result = stabilityAnalysis(input);
  } catch (err) {
    if (!(err instanceof StabilityInputError)) throw err;
    notice = `${err.message}.`;
  }
  const subset = result
    ? {
        excludedVarieties: result.excludedVarieties,
        excludedEnvironments: result.excludedEnvironments,
      }
    : balancedSubset(input);
  const usedEnvironments = new Map(result?.environments.map((e) => [e.environment, e]));
  const usedVarieties = new Map(result?.varieties.map((v) => [v.variety, v]));
  const reasonOf = (list: { name: string; reason: string }[], name: string) =>
    list.find((x) => x.name === name)?.reason ?? null;
  return {
    crop: ofCrop[0]!.crop,
    crops,
    traits: [...traitLabels].map(([key, label]) => ({ key, label })),
    trait,
    environments: columns.map((c, i) => {
      const used = usedEnvironments.get(String(i));
      return {
        ...c,
        used: Boolean(used),
        reason: used ? null : reasonOf(subset.excludedEnvironments, String(i)),
        mean: used?.mean ?? null,
        index: used?.index ?? null,
      };
    }),
    varieties: ofCrop.map((v) => {
      const f = usedVarieties.get(v.slug);
      return {
        slug: v.slug,
        name: v.name,
        environmentCount: cells.get(v.id)?.size ?? 0,
        used: Boolean(f),
        reason: f
          ? null
          : (reasonOf(subset.excludedVarieties, v.slug) ??
            (cells.has(v.id) ? null : 'not measured on this trait in any trial you may see')),
        figures: f
          ? {
              mean: f.mean,
              slope: f.slope,
              slopeSe: f.slopeSe,
              rSquared: f.rSquared,
              slopeVersusOneP: f.slopeVersusOneP,
              deviationMs: f.deviationMs,
              deviationDf: f.deviationDf,
              ecovalence: f.ecovalence,
              ecovalenceShare: f.ecovalenceShare,
            }
          : null,
      };
    }),
    grandMean: result?.grandMean ?? null,
    notice,
  };
}

/* ---------- Trials and their entries join the register ---------- */

/** The group a new trial belongs to: the first its lead coordinates, else one of the lead's own. */
export function groupForNewTrial(trx: DB, leadId: string): Promise<string> {
  return repo.ensureOwnGroup(trx, leadId);
}

/** Whoever copies a trial into a new season joins its group (the copy stays in the group). */
export function joinGroup(trx: DB, groupId: string, userId: string) {
  return repo.addGroupMember(trx, groupId, userId, userId);
}

/**
 * The register variety a trial entry grows: the one picked from the trial's group's register,
 * or, when none is picked, the register's variety of the entry's exact name (made in the same
 * step when the register has none). Null for a trial outside any group.
 */
export async function varietyForEntry(
  trx: DB,
  trial: Pick<Trial, 'group_id' | 'crop'>,
  entry: {
    varietyId: string | null;
    name: string;
    entryType: 'heirloom' | 'open_pollinated' | 'hybrid';
    seedSource: string;
  },
  by: string,
): Promise<string | null> {
  if (entry.varietyId !== null) {
    const found =
      trial.group_id && (await repo.findVarietyInGroup(trx, trial.group_id, entry.varietyId));
    if (!found)
      throw new AppError('validation_failed', 'Choose a variety from this trial’s register.', {
        fields: [
          { path: 'body.varietyId', message: 'Choose a variety from this trial’s register.' },
        ],
      });
    return found.id;
  }
  if (!trial.group_id) return null;
  return repo.varietyNamed(trx, {
    groupId: trial.group_id,
    name: entry.name,
    crop: trial.crop,
    type: entry.entryType,
    seedSource: entry.seedSource,
    by,
  });
}

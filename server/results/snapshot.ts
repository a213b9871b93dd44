/**
 * Builds the frozen snapshot a published version keeps: the numbers the analysis gives today,
 * the lead's text, the chosen photos, the growing conditions. Nothing here is recomputed later:
 * readers always see exactly what was published.
 */
import {
  defaultModelFor,
  twoFactorNote,
  type AnalysisModel,
} from '../../common/contracts/analysis';
import type { ResultSnapshot, SaveSheetBody, SnapshotTrait } from '../../common/contracts/results';
import { cautions, isSpinyCrop } from '../../common/cautions';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { analyzeForSheet, rankForSheet, seasonForSheet } from './sheet-analysis';
import { trialFactor } from '../trials/trials-service';

const spinyTraitKeys = ['spines'];

export async function defaultSheet(db: DB, trial: Trial): Promise<SaveSheetBody> {
  const traits = await db
    .selectFrom('traits')
    .select(['key', 'direction'])
    .where('trial_id', '=', trial.id)
    .orderBy('sort_order')
    .execute();
  return {
    summary: '',
    methods: null,
    traits: traits
      .filter((t) => t.direction !== 'none')
      .map((t) => ({ key: t.key, basis: 'plot' as const, weight: 1 })),
    entryNotes: {},
    coverPhotos: {},
    alpha: 0.05,
    letters: 'hsd',
    model: null,
    license: 'CC-BY-4.0',
  };
}

/** The model a sheet is analysed with: the lead's choice, else the one the design suggests. */
export const modelOfSheet = (trial: Trial, sheet: SaveSheetBody): AnalysisModel =>
  sheet.model ?? defaultModelFor(trial.design, trialFactor(trial) !== null);

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** A methods paragraph from the trial itself; the lead may replace it with their own words. */
export async function generatedMethods(
  db: DB,
  trial: Trial,
  sheet: SaveSheetBody,
): Promise<string> {
  const [sites, entries, plots] = await Promise.all([
    db
      .selectFrom('sites')
      .select(['name', 'region', 'soil_texture', 'irrigation_method'])
      .where('trial_id', '=', trial.id)
      .orderBy('name')
      .execute(),
    db
      .selectFrom('entries')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trial_id', '=', trial.id)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom('plots')
      .select([(eb) => eb.fn.countAll<number>().as('n'), (eb) => eb.fn.max('block').as('blocks')])
      .where('trial_id', '=', trial.id)
      .executeTakeFirstOrThrow(),
  ]);
  const siteText = sites
    .map(
      (s) =>
        `${s.name} (${[s.region, s.soil_texture, s.irrigation_method ? `${s.irrigation_method} irrigation` : null].filter(Boolean).join(', ')})`,
    )
    .join('; ');
  const fertilizer =
    trial.fertilizer_policy === 'none_applied'
      ? 'No fertilizer was applied.'
      : trial.fertilizer_policy === 'per_entry'
        ? 'Some entries received no fertilizer, as marked; the others as recorded in the field log.'
        : 'Fertilizer and amendments were applied as recorded in the field log.';
  const dates = [
    trial.sowing_date ? `sown ${trial.sowing_date}` : null,
    trial.transplant_date ? `transplanted ${trial.transplant_date}` : null,
  ]
    .filter(Boolean)
    .join(', ');
  const test =
    sheet.letters === 'hsd'
      ? "Tukey's honestly significant difference"
      : "Fisher's least significant difference";
  const blocks = Number(plots.blocks ?? 0);
  const layout =
    trial.design === 'crd'
      ? 'a completely randomized design'
      : trial.design === 'rcbd'
        ? `${plural(blocks, 'randomized complete block')}`
        : `${plural(blocks, 'randomized complete block')} at each of ${plural(sites.length, 'site')}`;
  return [
    `${Number(entries.n)} entries of ${trial.crop.toLowerCase()} were compared in ${layout}, ${plural(Number(plots.n), 'plot')} in all, in the ${trial.season} season${dates ? ` (${dates})` : ''}.`,
    sites.length ? `${sites.length === 1 ? 'Site' : 'Sites'}: ${siteText}.` : '',
    fertilizer,
    factorMethods(trial, sheet, test) ||
      (modelOfSheet(trial, sheet) === 'mixed'
        ? `Plot values were analysed with a linear mixed model fitted by REML: entries fixed; ${trial.design === 'multisite' ? 'sites, blocks within sites and, where the data allow, site × entry' : 'blocks'} random. Entries were tested by a Wald F test with Satterthwaite's denominator degrees of freedom, and ranked and separated on their estimated means (BLUEs) by ${test} at α = ${sheet.alpha}. Means followed by the same letter are not significantly different.`
        : `Plot values were analysed by analysis of variance (sequential sums of squares${trial.design === 'multisite' ? '; entries tested against the site × entry interaction' : ''}); means were separated by ${test} at α = ${sheet.alpha}. Means followed by the same letter are not significantly different.`),
  ]
    .filter(Boolean)
    .join(' ');
}

/** A two-factor trial's layout and analysis in words (empty for a one-factor trial). */
function factorMethods(trial: Trial, sheet: SaveSheetBody, test: string): string {
  const factor = trialFactor(trial);
  if (!factor) return '';
  const f = factor.name.toLowerCase();
  const layout = factor.arrangement === 'split_plot' ? 'split-plot' : 'factorial';
  return [
    `Every entry was grown at each level of ${f} (${factor.levels.join(', ')}), ${layout === 'split-plot' ? `the levels of ${f} on main plots within each block and the entries on subplots` : `every entry × ${f} combination randomized within each block`}.`,
    twoFactorNote({ layout, factor: factor.name }, modelOfSheet(trial, sheet)),
    `Entries were ranked and separated on their means over all levels of ${f} by ${test} at α = ${sheet.alpha}. Means followed by the same letter are not significantly different.`,
  ].join(' ');
}

export async function buildSnapshot(
  db: DB,
  trial: Trial,
  sheet: SaveSheetBody,
  meta: { version: number; changeNote: string; publishedAt: string },
): Promise<ResultSnapshot> {
  const [sites, entries, traitRows, plotCount, photos] = await Promise.all([
    db.selectFrom('sites').selectAll().where('trial_id', '=', trial.id).orderBy('name').execute(),
    db
      .selectFrom('entries as e')
      .leftJoin('varieties as v', 'v.id', 'e.variety_id')
      .selectAll('e')
      .select('v.slug as variety_slug')
      .where('e.trial_id', '=', trial.id)
      .orderBy('e.code')
      .execute(),
    db.selectFrom('traits').selectAll().where('trial_id', '=', trial.id).execute(),
    db
      .selectFrom('plots')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('trial_id', '=', trial.id)
      .executeTakeFirstOrThrow(),
    db
      .selectFrom('photos')
      .select(['id', 'entry_id', 'caption', 'display_width', 'display_height', 'is_cover'])
      .where('trial_id', '=', trial.id)
      .where('deleted_at', 'is', null)
      .execute(),
  ]);
  const traitByKey = new Map(traitRows.map((t) => [t.key, t]));

  const splitPlot = trialFactor(trial)?.arrangement === 'split_plot';
  // A split plot the lead left to the design is analysed as the analysis page does: by the
  // classical strata while complete, by the mixed model once it has lost plots.
  const asked = sheet.model ?? (splitPlot ? undefined : modelOfSheet(trial, sheet));
  const traits: SnapshotTrait[] = [];
  const plotValues: ResultSnapshot['plotValues'] = [];
  for (const choice of sheet.traits) {
    const trait = traitByKey.get(choice.key);
    if (!trait) continue;
    const result = await analyzeForSheet(db, trial, {
      trait: trait.key,
      basis: choice.basis,
      alpha: sheet.alpha,
      letters: sheet.letters,
      ...(asked ? { model: asked } : {}),
    });
    if (!result) continue;
    traits.push({
      key: trait.key,
      label: trait.label,
      unit: result.unit,
      ...(trait.display_unit ? { displayUnit: trait.display_unit } : {}),
      quantityKind: trait.quantity_kind,
      basis: choice.basis,
      direction: trait.direction,
      weight: choice.weight,
      decimals: result.decimals,
      design: result.design,
      n: result.n,
      grandMean: result.grandMean,
      cvPercent: Number.isFinite(result.cvPercent) ? result.cvPercent : null,
      anova: result.anova,
      means: result.means.map((m) => {
        // Unbalanced layouts and the mixed model rank by the adjusted means (BLUEs); the sheet
        // shows them beside the plain ones.
        const adjusted =
          result.method === 'least-squares' || result.model === 'mixed'
            ? result.adjustedMeans.find((a) => a.variety === m.variety)
            : undefined;
        return {
          variety: m.variety,
          n: m.n,
          mean: m.mean,
          sd: m.sd,
          se: m.se,
          ...(adjusted ? { adjustedMean: adjusted.mean, adjustedSe: adjusted.se } : {}),
          rank: m.rank,
          group: m.group,
        };
      }),
      lsd: result.lsd,
      hsd: result.hsd,
      model: result.model,
      ...(result.varianceComponents ? { varianceComponents: result.varianceComponents } : {}),
      ...(result.fixedTest
        ? {
            fixedTest: {
              numDf: result.fixedTest.numDf,
              denDf: result.fixedTest.denDf,
              f: result.fixedTest.f,
              p: result.fixedTest.p,
              method: result.fixedTest.method,
            },
          }
        : {}),
      ...(result.varianceSummary ? { varianceSummary: result.varianceSummary } : {}),
      ...(result.twoFactor
        ? {
            twoFactor: {
              ...result.twoFactor,
              strata: twoFactorNote(result.twoFactor, result.model ?? modelOfSheet(trial, sheet)),
            },
          }
        : {}),
      warnings: result.warnings,
    });
    for (const v of result.plotValues) plotValues.push({ trait: trait.key, ...v });
  }

  // The sheet's model: the lead's, else the one every trait was analysed with, else the design's.
  const traitModels = new Set(traits.map((t) => t.model ?? 'anova'));
  const model =
    sheet.model ?? (traitModels.size === 1 ? [...traitModels][0]! : modelOfSheet(trial, sheet));
  const ranking = rankForSheet(traits);
  const conditions = await seasonForSheet(db, trial);
  const photoById = new Map(photos.map((p) => [p.id, p]));
  const crop = trial.crop;
  const hasSpines = traitRows.some((t) => spinyTraitKeys.includes(t.key)) || isSpinyCrop(crop);
  const spiny = cautions['spiny-crop'];

  return {
    trial: {
      title: trial.title,
      slug: trial.slug,
      crop: trial.crop,
      season: trial.season,
      design: trial.design,
      description: trial.description,
      sowingDate: trial.sowing_date,
      transplantDate: trial.transplant_date,
    },
    version: meta.version,
    publishedAt: meta.publishedAt,
    changeNote: meta.changeNote,
    alpha: sheet.alpha,
    letters: sheet.letters,
    model,
    license: sheet.license,
    summary: sheet.summary,
    methods:
      sheet.methods ??
      [await generatedMethods(db, trial, { ...sheet, model }), mixedTraitsNote(traits, model)]
        .filter(Boolean)
        .join(' '),
    plotCount: Number(plotCount.n),
    // Town or region only: a volunteer's garden is never located more closely on a public page.
    sites: sites.map((s) => {
      const c = conditions.get(s.id);
      return {
        name: s.name,
        region: s.region,
        soilTexture: s.soil_texture,
        irrigationMethod: s.irrigation_method,
        rainMm: c?.rainMm ?? null,
        irrigationMm: c?.irrigationMm ?? null,
        degreeDays: c?.degreeDays ?? null,
        degreeDayBaseC: c?.degreeDayBaseC ?? null,
        hotDays: c?.hotDays ?? null,
      };
    }),
    entries: entries.map((e) => {
      const note = sheet.entryNotes[e.id] ?? '';
      // The sheet's own choice, else the cover the lead marked in the gallery.
      const photoId =
        sheet.coverPhotos[e.id] ?? photos.find((p) => p.entry_id === e.id && p.is_cover)?.id;
      const photo = photoId ? photoById.get(photoId) : undefined;
      const mentionsIrritation = /spine|spiny|itch|irritat|prickl/i.test(note);
      return {
        id: e.id,
        code: e.code,
        name: e.name,
        seedSource: e.seed_source,
        entryType: e.entry_type,
        varietySlug: e.variety_slug,
        note,
        caution: mentionsIrritation ? `${spiny.title}: ${spiny.points[0]}` : null,
        photo: photo
          ? {
              id: photo.id,
              caption: photo.caption,
              width: photo.display_width,
              height: photo.display_height,
            }
          : null,
      };
    }),
    traits,
    ranking,
    cautions: hasSpines ? [`${spiny.title}: ${spiny.points.join(' ')}`] : [],
    plotValues,
  };
}

/**
 * Traits analysed by another model than the sheet's (a split plot left to the design: those
 * that lost plots by the mixed model), named so the methods never contradict their numbers.
 */
export function mixedTraitsNote(traits: SnapshotTrait[], model: AnalysisModel): string {
  const other = traits.filter((t) => (t.model ?? 'anova') !== model);
  if (other.length === 0) return '';
  const names = other.map((t) => t.label).join(', ');
  return model === 'anova'
    ? `${names} lost plots, so ${other.length === 1 ? 'it was' : 'they were'} analysed by the mixed model instead (REML: blocks and main plots random; Wald F tests with Satterthwaite's df), and ranked on that model's means.`
    : `${names} ${other.length === 1 ? 'was' : 'were'} analysed by the classical analysis of variance instead.`;
}

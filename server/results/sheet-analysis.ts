/**
 * What the results sheet takes from the analysis: the same service the trial analysis API
 * answers with (so the published numbers equal the API's), and the engine's cross-trait ranking
 * over exactly the traits and bases the sheet shows.
 */
import type { AnalysisModel } from '../../common/contracts/analysis';
import type { ResultSnapshot, SnapshotTrait } from '../../common/contracts/results';
import type { DB } from '../../db/database';
import type { Trial } from '../../db/schema';
import { analyseTrialTrait } from '../analysis/analysis-service';
import { rankAcrossTraits } from '../analysis/engine/ranking';
import { AppError } from '../lib/app-error';
import { seasonOfTrial } from '../weather/weather-service';

export async function analyzeForSheet(
  db: DB,
  trial: Trial,
  choice: {
    trait: string;
    basis: SnapshotTrait['basis'];
    alpha: number;
    letters: 'hsd' | 'lsd';
    /** Left out: the analysis decides (a split plot that lost plots takes the mixed model). */
    model?: AnalysisModel;
  },
) {
  try {
    const result = await analyseTrialTrait(db, trial, choice);
    return {
      ...result,
      plotValues: result.plotValues.map((v) => ({
        site: v.site ?? null,
        block: v.block === null || v.block === undefined ? null : String(v.block),
        plot: String(v.plotNumber),
        variety: v.entry,
        ...(v.treatment != null ? { treatment: v.treatment } : {}),
        value: v.value,
      })),
    };
  } catch (err) {
    // A trait with no records yet is left off the sheet rather than failing the whole sheet.
    if (err instanceof AppError && err.code === 'unprocessable') return null;
    throw err;
  }
}

export function rankForSheet(traits: SnapshotTrait[]): ResultSnapshot['ranking'] {
  const directional = traits.filter((t) => t.direction !== 'none' && t.weight > 0);
  if (directional.length === 0) return [];
  const varieties = traits[0]!.means
    .map((m) => m.variety)
    .filter((v) => traits.every((t) => t.means.some((m) => m.variety === v)));
  if (varieties.length < 2) return [];
  const ranking = rankAcrossTraits(
    traits.map((t) => ({
      trait: t.key,
      direction: t.direction,
      weight: t.weight,
      // The mean each trait ranks by: adjusted (least-squares or mixed-model) where stored.
      means: Object.fromEntries(t.means.map((m) => [m.variety, m.adjustedMean ?? m.mean])),
    })),
    varieties,
  );
  return ranking.entries
    .map((e) => ({
      variety: e.entry,
      rank: e.indexRank,
      index: e.index,
      rankSum: e.rankSum,
      contributions: Object.fromEntries(e.contributions.map((c) => [c.trait, c.contribution])),
    }))
    .sort((a, b) => a.rank - b.rank);
}

export interface SiteConditions {
  rainMm: number | null;
  irrigationMm: number | null;
  degreeDays: number | null;
  degreeDayBaseC: number | null;
  hotDays: number | null;
}

/** Growing conditions per site id, from the same season summary the trial's season API gives. */
export async function seasonForSheet(db: DB, trial: Trial): Promise<Map<string, SiteConditions>> {
  const s = await seasonOfTrial(db, trial, {});
  return new Map(
    s.sites.map((site) => [
      site.siteId,
      {
        rainMm: site.rainSource === 'none' ? null : site.water.rainMm,
        irrigationMm: site.water.irrigationMm,
        degreeDays: site.weatherDays > site.daysWithoutTemperatures ? site.degreeDays : null,
        degreeDayBaseC: s.thresholds.baseC,
        hotDays: site.weatherDays > site.daysWithoutTemperatures ? site.hotDays : null,
      },
    ]),
  );
}

/**
 * Plot values from raw records: season harvest totals, timing, per-plant observations
 * averaged per plot, and normalisation per plant, per metre of row and per area.
 * Units in are SI: grams, metres, square metres.
 */
import { daysBetween, dayNumber } from '../../../common/calendar-date';

/** Square metres in a hectare. */
export const SQUARE_METRES_PER_HECTARE = 10_000;
/** Square metres in an international acre: exactly 4046.8564224 (NIST; 43 560 ft², 1 ft = 0.3048 m). */
export const SQUARE_METRES_PER_ACRE = 4046.8564224;
/** Kilograms in an avoirdupois pound: exactly 0.45359237 (NIST). */
export const KILOGRAMS_PER_POUND = 0.45359237;

export interface HarvestRecord {
  plotId: string;
  /** YYYY-MM-DD */
  date: string;
  /** Number of fruit, pods, heads … picked. */
  count: number;
  massG: number;
  marketable: boolean;
}

export interface PlotInfo {
  plotId: string;
  entryId: string;
  siteId: string;
  block: string;
  plantsSet: number;
  /** Plants alive at the end; per-plant values use this when given. */
  plantsSurviving?: number;
  rowLengthM: number;
  /** Distance between rows (the width of ground each row stands for). */
  rowSpacingM: number;
  sowingDate?: string;
  transplantDate?: string;
}

export interface ObservationRecord {
  plotId: string;
  value: number;
  /** Sample plant; several plants in a plot are sub-samples, averaged to one plot value. */
  plantNumber?: number;
}

export interface Amount {
  count: number;
  massG: number;
}

export interface Normalised {
  /** Per plant (surviving plants when known, else plants set); null with no plants. */
  perPlant: Amount | null;
  perMetreOfRow: Amount | null;
  perSquareMetre: Amount | null;
  /** Mass estimate scaled from the plot area. */
  kgPerHectare: number | null;
  kgPerAcre: number | null;
  lbPerAcre: number | null;
}

export interface PlotHarvestSummary {
  plotId: string;
  entryId: string;
  siteId: string;
  block: string;
  /** Distinct harvest dates. */
  harvests: number;
  firstHarvest: string | null;
  lastHarvest: string | null;
  daysFromSowingToFirstHarvest: number | null;
  daysFromTransplantToFirstHarvest: number | null;
  marketable: Amount;
  total: Amount;
  /** Mean fruit (pod) mass = mass / count; null when nothing was counted. */
  meanFruitMassG: { marketable: number | null; total: number | null };
  /** Plants used for the per-plant values, and which count they are. */
  plants: { count: number; basis: 'surviving' | 'set' };
  areaM2: number;
  marketablePer: Normalised;
  totalPer: Normalised;
}

function normalise(a: Amount, plants: number, rowLengthM: number, areaM2: number): Normalised {
  const per = (d: number): Amount | null =>
    d > 0 ? { count: a.count / d, massG: a.massG / d } : null;
  const perM2 = per(areaM2);
  return {
    perPlant: per(plants),
    perMetreOfRow: per(rowLengthM),
    perSquareMetre: perM2,
    kgPerHectare: perM2 ? (perM2.massG * SQUARE_METRES_PER_HECTARE) / 1000 : null,
    kgPerAcre: perM2 ? (perM2.massG * SQUARE_METRES_PER_ACRE) / 1000 : null,
    lbPerAcre: perM2 ? (perM2.massG * SQUARE_METRES_PER_ACRE) / 1000 / KILOGRAMS_PER_POUND : null,
  };
}

/**
 * One plot's harvests added up: as the database keeps them (plot_harvest_totals), or by
 * summariseHarvests.
 */
export interface PlotHarvestTotals {
  plotId: string;
  marketable: Amount;
  total: Amount;
  /** Days with a harvest. */
  days: number;
  /** YYYY-MM-DD of the first and last harvest; null with none. */
  first: string | null;
  last: string | null;
}

/** Season summary for every plot in `plots` (plots with no harvest get zeros). */
export function summariseHarvests(
  plots: readonly PlotInfo[],
  harvests: readonly HarvestRecord[],
): PlotHarvestSummary[] {
  const byPlot = new Map<string, PlotHarvestTotals & { dates: Set<string> }>();
  for (const p of plots)
    byPlot.set(p.plotId, {
      plotId: p.plotId,
      marketable: { count: 0, massG: 0 },
      total: { count: 0, massG: 0 },
      days: 0,
      first: null,
      last: null,
      dates: new Set(),
    });
  for (const h of harvests) {
    const t = byPlot.get(h.plotId);
    if (!t) throw new RangeError(`harvest on ${h.date} names unknown plot "${h.plotId}"`);
    if (!(h.count >= 0) || !(h.massG >= 0))
      throw new RangeError(
        `harvest on ${h.date} for plot "${h.plotId}": negative or missing amount`,
      );
    dayNumber(h.date); // validates the date
    t.total.count += h.count;
    t.total.massG += h.massG;
    if (h.marketable) {
      t.marketable.count += h.count;
      t.marketable.massG += h.massG;
    }
    t.dates.add(h.date);
    if (t.first === null || h.date < t.first) t.first = h.date;
    if (t.last === null || h.date > t.last) t.last = h.date;
  }
  return summarisePlotTotals(
    plots,
    [...byPlot.values()].map(({ dates, ...t }) => ({ ...t, days: dates.size })),
  );
}

/** Season summary for every plot in `plots` from its totals (a plot with none gets zeros). */
export function summarisePlotTotals(
  plots: readonly PlotInfo[],
  totals: readonly PlotHarvestTotals[],
): PlotHarvestSummary[] {
  const byPlot = new Map<string, PlotHarvestTotals>();
  const known = new Set(plots.map((p) => p.plotId));
  for (const t of totals) {
    if (!known.has(t.plotId)) throw new RangeError(`harvests name unknown plot "${t.plotId}"`);
    byPlot.set(t.plotId, t);
  }
  return plots.map((p) => {
    const t = byPlot.get(p.plotId);
    const marketable: Amount = t?.marketable ?? { count: 0, massG: 0 };
    const total: Amount = t?.total ?? { count: 0, massG: 0 };
    const first = t?.first ?? null;
    const last = t?.last ?? null;
    const plantsCount = p.plantsSurviving ?? p.plantsSet;
    const areaM2 = p.rowLengthM * p.rowSpacingM;
    return {
      plotId: p.plotId,
      entryId: p.entryId,
      siteId: p.siteId,
      block: p.block,
      harvests: t?.days ?? 0,
      firstHarvest: first,
      lastHarvest: last,
      daysFromSowingToFirstHarvest: first && p.sowingDate ? daysBetween(p.sowingDate, first) : null,
      daysFromTransplantToFirstHarvest:
        first && p.transplantDate ? daysBetween(p.transplantDate, first) : null,
      marketable,
      total,
      meanFruitMassG: {
        marketable: marketable.count > 0 ? marketable.massG / marketable.count : null,
        total: total.count > 0 ? total.massG / total.count : null,
      },
      plants: { count: plantsCount, basis: p.plantsSurviving === undefined ? 'set' : 'surviving' },
      areaM2,
      marketablePer: normalise(marketable, plantsCount, p.rowLengthM, areaM2),
      totalPer: normalise(total, plantsCount, p.rowLengthM, areaM2),
    };
  });
}

export interface PlotObservationMean {
  plotId: string;
  /** Mean over sample plants: the plot value (sub-samples are not replicates). */
  mean: number;
  /** Sample plants averaged. */
  samples: number;
}

/** One value per plot from per-plant (or repeated) observations, in first-seen plot order. */
export function plotObservationMeans(
  observations: readonly ObservationRecord[],
): PlotObservationMean[] {
  const acc = new Map<string, { sum: number; n: number; values: number[] }>();
  for (const o of observations) {
    if (!Number.isFinite(o.value))
      throw new RangeError(`plot "${o.plotId}": observation is not a number`);
    let a = acc.get(o.plotId);
    if (!a) {
      a = { sum: 0, n: 0, values: [] };
      acc.set(o.plotId, a);
    }
    a.values.push(o.value);
    a.sum += o.value;
    a.n++;
  }
  return [...acc].map(([plotId, a]) => {
    // Two-pass mean: corrects the rounding of the first sum.
    const m = a.sum / a.n;
    const corr = a.values.reduce((s, v) => s + (v - m), 0) / a.n;
    return { plotId, mean: m + corr, samples: a.n };
  });
}

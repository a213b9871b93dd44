/**
 * One value per plot for one trait, from a trial's records: season harvest totals (through
 * the engine's summarisePlotTotals, from per-plot sums the database adds up), per-plant observations averaged per plot, or repeated
 * plot scores averaged; then normalised per plant, per metre of row or per area. Pure.
 */
import type { AnalysisBasis, DerivedTraitKey } from '../../common/contracts/analysis';
import { recordedDecimals, roundTo } from '../../common/precision';
import { daysBetween } from '../../common/calendar-date';
import {
  plotObservationMeans,
  summarisePlotTotals,
  type PlotHarvestSummary,
  type PlotHarvestTotals,
  type PlotInfo,
} from './engine/plot-values';

export interface PlotRecord {
  id: string;
  plot_number: number;
  block: number;
  /** Incomplete blocks and networks: the replicate the block belongs to. */
  replicate?: number | null;
  /** The plot's level of the second factor (null in a one-factor trial). */
  treatment?: string | null;
  site_id: string;
  site_name: string;
  entry_id: string;
  entry_name: string;
  entry_code: string;
  plants_set: number | null;
  plants_surviving: number | null;
  row_length_mm: number | null;
  row_spacing_mm: number | null;
}

export interface TrialFrame {
  sowingDate: string | null;
  transplantDate: string | null;
  rowsPerPlot: number;
  /** Trial-wide plot dimensions, used where a plot has none of its own. */
  rowLengthMm: number | null;
  rowSpacingMm: number | null;
}

/** A trial's live harvests added up per plot, and the most decimals any recorded mass has. */
export interface HarvestTotals {
  plots: readonly PlotHarvestTotals[];
  massDecimals: number;
}

export interface ObservationRow {
  plot_id: string;
  value: number | null;
  value_date: string | null;
  plant_number: number | null;
}

export type TraitSource =
  | { kind: 'harvest'; quantityKind: string }
  | { kind: 'derived'; key: DerivedTraitKey }
  | { kind: 'observation'; basis: 'plant' | 'plot'; quantityKind: string };

export class PlotValueError extends Error {
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = 'PlotValueError';
  }
}

export interface BuiltValue {
  plot: PlotRecord;
  value: number;
}

export interface BuiltPlotValues {
  values: BuiltValue[];
  unit: string;
  valueNote: string;
  warnings: string[];
  /** Decimals to show and export plot values and means with (common/precision.ts). */
  decimals: { plotValue: number; mean: number };
}

/** A sum keeps the recorded decimals; an average or ratio gets one more; means one more again. */
function decimalsFrom(recorded: number, plotValueIs: 'sum' | 'average') {
  const plotValue = recorded + (plotValueIs === 'average' ? 1 : 0);
  return { plotValue, mean: plotValue + 1 };
}

const SQUARE_METRES_PER_HECTARE = 10_000;

const baseUnitOf: Record<string, string> = {
  mass: 'g',
  length: 'mm',
  count: 'count',
  score: 'score',
  percent: '%',
  date: 'd',
};

function areaUnit(base: 'g' | 'count', basis: AnalysisBasis): string {
  if (basis === 'plot') return base;
  if (basis === 'plant') return `${base}/plant`;
  if (basis === 'm') return `${base}/m`;
  if (basis === 'm2') return `${base}/m²`;
  if (basis === 'ha') return base === 'g' ? 'kg/ha' : 'count/ha';
  return base === 'g' ? 'lb/acre' : 'count/acre';
}

const startOf = (frame: TrialFrame) => frame.transplantDate ?? frame.sowingDate;
const startWord = (frame: TrialFrame) => (frame.transplantDate ? 'transplanting' : 'sowing');

export function buildPlotValues(
  source: TraitSource,
  basis: AnalysisBasis,
  frame: TrialFrame,
  plots: readonly PlotRecord[],
  harvests: HarvestTotals,
  observations: readonly ObservationRow[],
): BuiltPlotValues {
  const amount =
    source.kind === 'harvest' &&
    (source.quantityKind === 'mass' || source.quantityKind === 'count');
  if (basis !== 'plot' && !amount) {
    throw new PlotValueError(
      'Only harvest amounts (mass or count) can be expressed per plant, per metre of row or per area; use basis "plot".',
      'query.basis',
    );
  }
  if (source.kind === 'observation') return fromObservations(source, frame, plots, observations);
  return fromHarvests(source, basis, frame, plots, harvests);
}

function fromObservations(
  source: Extract<TraitSource, { kind: 'observation' }>,
  frame: TrialFrame,
  plots: readonly PlotRecord[],
  observations: readonly ObservationRow[],
): BuiltPlotValues {
  const start = startOf(frame);
  const readings = observations.map((o) => {
    let value: number;
    if (o.value !== null) value = o.value;
    else if (o.value_date !== null && start) value = daysBetween(start, o.value_date);
    else
      throw new PlotValueError(
        `Dates are analysed as days from ${startWord(frame)}, and the trial has no sowing or transplanting date.`,
      );
    return { plotId: o.plot_id, value, ...(o.plant_number ? { plantNumber: o.plant_number } : {}) };
  });
  const means = new Map(plotObservationMeans(readings).map((m) => [m.plotId, m]));
  const values: BuiltValue[] = [];
  let multi = 0;
  let readingsAveraged = 0;
  for (const plot of plots) {
    const m = means.get(plot.id);
    if (!m) continue;
    if (m.samples > 1) {
      multi++;
      readingsAveraged += m.samples;
    }
    values.push({ plot, value: m.mean });
  }
  const warnings: string[] = [];
  const noRecord = plots.length - values.length;
  if (noRecord > 0) warnings.push(`${noRecord} plot(s) have no reading for this trait: left out`);
  if (multi > 0) {
    warnings.push(
      source.basis === 'plant'
        ? `sub-samples averaged: ${readingsAveraged} plant readings in ${multi} plots became one value per plot (sample plants are not replicates)`
        : `repeated scores averaged: ${readingsAveraged} scores in ${multi} plots became one value per plot`,
    );
  }
  const unit = baseUnitOf[source.quantityKind] ?? '';
  const recorded = recordedDecimals(readings.map((r) => r.value));
  return {
    values,
    unit,
    decimals: decimalsFrom(recorded, multi > 0 ? 'average' : 'sum'),
    valueNote:
      source.quantityKind === 'date'
        ? `days from ${startWord(frame)} to the recorded date, averaged per plot`
        : source.basis === 'plant'
          ? 'mean of the sample plants in each plot'
          : 'the plot score (repeated scores averaged)',
    warnings,
  };
}

function fromHarvests(
  source: Exclude<TraitSource, { kind: 'observation' }>,
  basis: AnalysisBasis,
  frame: TrialFrame,
  plots: readonly PlotRecord[],
  harvests: HarvestTotals,
): BuiltPlotValues {
  const rows = Math.max(1, frame.rowsPerPlot);
  const infos: PlotInfo[] = plots.map((p) => {
    const lengthMm = p.row_length_mm ?? frame.rowLengthMm ?? 0;
    const spacingMm = p.row_spacing_mm ?? frame.rowSpacingMm ?? 0;
    return {
      plotId: p.id,
      entryId: p.entry_id,
      siteId: p.site_id,
      block: String(p.block),
      plantsSet: p.plants_set ?? 0,
      ...(p.plants_surviving !== null ? { plantsSurviving: p.plants_surviving } : {}),
      // Every row of the plot counts toward its length; the plot's area is rows × length × spacing.
      rowLengthM: (rows * lengthMm) / 1000,
      rowSpacingM: spacingMm / 1000,
      ...(frame.sowingDate ? { sowingDate: frame.sowingDate } : {}),
      ...(frame.transplantDate ? { transplantDate: frame.transplantDate } : {}),
    };
  });
  const summaries = summarisePlotTotals(infos, harvests.plots);
  const warnings: string[] = [];
  let noHarvest = 0;
  let noSize = 0;
  const values: BuiltValue[] = [];
  let unit: string;
  let note: string;
  let pick: (s: PlotHarvestSummary) => number | null;
  let plotValueIs: 'sum' | 'average' = 'average';
  let recorded = 0;

  if (source.kind === 'derived' && source.key === 'days_to_first_harvest') {
    if (!startOf(frame))
      throw new PlotValueError(
        'Days to first harvest needs the trial’s sowing or transplant date.',
      );
    unit = 'd';
    plotValueIs = 'sum';
    note = `days from ${startWord(frame)} to the first harvest of the plot`;
    pick = (s) =>
      frame.transplantDate ? s.daysFromTransplantToFirstHarvest : s.daysFromSowingToFirstHarvest;
  } else if (source.kind === 'derived') {
    unit = 'g';
    recorded = harvests.massDecimals;
    note = 'marketable mass ÷ marketable fruit count over the season';
    pick = (s) => s.meanFruitMassG.marketable;
  } else if (source.quantityKind === 'percent') {
    unit = '%';
    note = 'marketable share of the harvested mass over the season';
    pick = (s) => (s.total.massG > 0 ? (100 * s.marketable.massG) / s.total.massG : null);
  } else if (source.quantityKind === 'mass' || source.quantityKind === 'count') {
    const isMass = source.quantityKind === 'mass';
    unit = areaUnit(isMass ? 'g' : 'count', basis);
    recorded = isMass ? harvests.massDecimals : 0;
    if (basis === 'plot') plotValueIs = 'sum';
    note = `season total of marketable ${isMass ? 'mass' : 'fruit count'} per plot${
      basis === 'plot'
        ? ''
        : basis === 'plant'
          ? ', divided by the plants in the plot (surviving, else set)'
          : basis === 'm'
            ? ', divided by the length of row in the plot'
            : basis === 'm2'
              ? ', divided by the plot area (rows × row length × row spacing)'
              : ', scaled from the plot area: an estimate, not a field-scale yield'
    }`;
    const get = (s: PlotHarvestSummary, key: 'count' | 'massG') => {
      const per = s.marketablePer;
      if (basis === 'plot') return s.marketable[key];
      if (basis === 'plant') return per.perPlant?.[key] ?? null;
      if (basis === 'm') return per.perMetreOfRow?.[key] ?? null;
      const perM2 = per.perSquareMetre?.[key];
      if (perM2 === undefined) return null;
      if (basis === 'm2') return perM2;
      if (basis === 'ha')
        return key === 'massG' ? per.kgPerHectare : perM2 * SQUARE_METRES_PER_HECTARE;
      return key === 'massG' ? per.lbPerAcre : perM2 * 4046.8564224;
    };
    pick = (s) => get(s, isMass ? 'massG' : 'count');
  } else {
    throw new PlotValueError(
      `A harvest trait measured as "${source.quantityKind}" cannot be built from harvest records.`,
    );
  }

  summaries.forEach((s, i) => {
    if (s.harvests === 0) {
      noHarvest++;
      return;
    }
    const v = pick(s);
    if (v === null || !Number.isFinite(v)) {
      noSize++;
      return;
    }
    // A season total of recorded amounts is exact at the recorded decimals: what is beyond
    // them is binary float noise from the summing, not data.
    values.push({ plot: plots[i]!, value: plotValueIs === 'sum' ? roundTo(v, recorded) : v });
  });
  if (noHarvest > 0)
    warnings.push(
      `${noHarvest} plot(s) have no harvest records: left out as missing (log a harvest of 0 for a plot that truly yielded nothing)`,
    );
  if (noSize > 0) {
    const why =
      basis === 'plant'
        ? 'no plant count'
        : basis === 'plot'
          ? 'nothing to divide (no marketable fruit counted)'
          : 'no recorded plot size (row length and spacing)';
    warnings.push(`${noSize} plot(s) left out: ${why}`);
  }
  if (values.length === 0 && noSize > 0 && basis !== 'plot') {
    throw new PlotValueError(
      basis === 'plant'
        ? 'No plot has a plant count: record plants set or surviving, or use basis "plot".'
        : 'No plot has a recorded size: set the row length and spacing, or use basis "plot".',
      'query.basis',
    );
  }
  return { values, unit, valueNote: note, warnings, decimals: decimalsFrom(recorded, plotValueIs) };
}

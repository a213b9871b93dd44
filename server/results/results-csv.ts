import { writeCsv } from '../../common/csv';
import {
  sheetModel,
  sheetTraitDecimals,
  type ResultSnapshot,
} from '../../common/contracts/results';
import { exportNumber } from '../../common/precision';
import { rankMeans } from '../../common/ranking';

/**
 * Entry means per trait, one row each, best first; rank 1 = best in the trait's direction and
 * empty for a trait with no preferred direction.
 */
export function meansCsv(s: ResultSnapshot): string {
  const rows = s.traits.flatMap((t) => {
    const d = sheetTraitDecimals(s, t).mean;
    return rankMeans(t.means, t.direction).map((m) => ({
      trait: t.key,
      unit: t.unit,
      direction: t.direction,
      variety: m.variety,
      n: m.n,
      mean: exportNumber(m.mean, d),
      se: exportNumber(m.se, d),
      // The mean the rank and letters follow where it differs from the plain one (unbalanced
      // layouts, the mixed model); empty where they are the same.
      adjusted_mean: m.adjustedMean === undefined ? '' : exportNumber(m.adjustedMean, d),
      adjusted_se: m.adjustedSe == null ? '' : exportNumber(m.adjustedSe, d),
      group: m.group,
      rank: m.rank ?? '',
      alpha: s.alpha,
      model: t.model ?? sheetModel(s),
      version: s.version,
      license: s.license,
    }));
  });
  return csvOf(MEANS_COLUMNS, rows);
}

/**
 * The plot values behind the published numbers, in the shape the analyze command reads
 * (variety, site, block, plot, value): one file per trait re-imports to the same analysis.
 */
export function plotsCsv(s: ResultSnapshot, trait?: string): string {
  const decimals = new Map(s.traits.map((t) => [t.key, sheetTraitDecimals(s, t).plotValue]));
  const rows = s.plotValues
    .filter((v) => !trait || v.trait === trait)
    .map((v) => ({
      trait: v.trait,
      unit: s.traits.find((t) => t.key === v.trait)?.unit ?? '',
      variety: v.variety,
      site: v.site ?? '',
      block: v.block ?? '',
      plot: v.plot ?? '',
      value: exportNumber(v.value, decimals.get(v.trait) ?? 0),
    }));
  return csvOf(PLOT_COLUMNS, rows);
}

const MEANS_COLUMNS = [
  'trait',
  'unit',
  'direction',
  'variety',
  'n',
  'mean',
  'se',
  'adjusted_mean',
  'adjusted_se',
  'group',
  'rank',
  'alpha',
  'model',
  'version',
  'license',
] as const;
const PLOT_COLUMNS = ['trait', 'unit', 'variety', 'site', 'block', 'plot', 'value'] as const;

function csvOf<K extends string>(columns: readonly K[], rows: Record<K, unknown>[]): string {
  return writeCsv(
    columns,
    rows.map((r) => columns.map((k) => r[k])),
  );
}

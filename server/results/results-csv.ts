import { treatmentColumn, writeCsv } from '../../common/csv';
import {
  sheetFactor,
  sheetModel,
  sheetTraitDecimals,
  type ResultSnapshot,
} from '../../common/contracts/results';
import { exportNumber } from '../../common/precision';
import { rankMeans } from '../../common/ranking';

/**
 * Entry means per trait, one row each, best first; rank 1 = best in the trait's direction and
 * empty for a trait with no preferred direction. A two-factor sheet adds, per trait, the cell
 * means (entry × treatment level) and the treatment's means; `means_of` says which a row is and
 * the treatment's column is named as the lead named it.
 */
export function meansCsv(s: ResultSnapshot): string {
  const factor = sheetFactor(s);
  const rows = s.traits.flatMap((t) => {
    const d = sheetTraitDecimals(s, t).mean;
    const common = {
      trait: t.key,
      unit: t.unit,
      direction: t.direction,
      alpha: s.alpha,
      model: t.model ?? sheetModel(s),
      version: s.version,
      license: s.license,
    };
    const entries = rankMeans(t.means, t.direction).map((m) => ({
      ...common,
      means_of: 'entry',
      treatment: '',
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
    }));
    const two = t.twoFactor;
    if (!two) return entries;
    const plots = s.plotValues.filter((v) => v.trait === t.key);
    const count = (variety: string | null, treatment: string) =>
      plots.filter((v) => v.treatment === treatment && (variety === null || v.variety === variety))
        .length;
    const unranked = { adjusted_mean: '', adjusted_se: '', group: '', rank: '' };
    return [
      ...entries,
      ...two.cellMeans.map((c) => ({
        ...common,
        ...unranked,
        means_of: 'entry × treatment',
        treatment: c.treatment,
        variety: c.variety,
        n: count(c.variety, c.treatment),
        mean: exportNumber(c.mean, d),
        se: exportNumber(c.se, d),
      })),
      ...two.treatmentMeans.map((m) => ({
        ...common,
        ...unranked,
        means_of: 'treatment',
        treatment: m.treatment,
        variety: '',
        n: count(null, m.treatment),
        mean: exportNumber(m.mean, d),
        se: exportNumber(m.se, d),
      })),
    ];
  });
  if (!factor) return csvOf(MEANS_COLUMNS, rows);
  const columns = [
    'trait',
    'unit',
    'direction',
    'means_of',
    'variety',
    'treatment',
    ...MEANS_COLUMNS.slice(4),
  ] as const;
  return csvOf(columns, rows, { treatment: treatmentColumn(factor.factor, columns) });
}

/**
 * The plot values behind the published numbers, in the shape the analyze command reads
 * (variety, site, block, plot, value): one file per trait re-imports to the same analysis.
 */
export function plotsCsv(s: ResultSnapshot, trait?: string): string {
  const factor = sheetFactor(s);
  const decimals = new Map(s.traits.map((t) => [t.key, sheetTraitDecimals(s, t).plotValue]));
  const rows = s.plotValues
    .filter((v) => !trait || v.trait === trait)
    .map((v) => ({
      trait: v.trait,
      unit: s.traits.find((t) => t.key === v.trait)?.unit ?? '',
      variety: v.variety,
      treatment: v.treatment ?? '',
      site: v.site ?? '',
      block: v.block ?? '',
      plot: v.plot ?? '',
      value: exportNumber(v.value, decimals.get(v.trait) ?? 0),
    }));
  if (!factor) return csvOf(PLOT_COLUMNS, rows);
  // The treatment beside the variety, under its own name: `analyze --factor <name>` reads it.
  const columns = ['trait', 'unit', 'variety', 'treatment', ...PLOT_COLUMNS.slice(3)] as const;
  return csvOf(columns, rows, { treatment: treatmentColumn(factor.factor, columns) });
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

function csvOf<K extends string>(
  columns: readonly K[],
  rows: Record<K, unknown>[],
  headers: Partial<Record<K, string>> = {},
): string {
  return writeCsv(
    columns.map((k) => headers[k] ?? k),
    rows.map((r) => columns.map((k) => r[k])),
  );
}

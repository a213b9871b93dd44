/**
 * The variety page's chart table: one row per trial (oldest season first, as the record lists
 * them), one column per site, each cell the variety's mean at that site in the shown unit,
 * rounded to the precision shown in the table (no float noise in the tooltip). Pure.
 */
import type { VarietyTrial } from '@common/contracts/varieties';
import { decimalsInUnit, roundTo } from '@common/precision';

export type SeasonChartRow = Record<string, string | number | null>;
export interface SeasonChartTable {
  rows: SeasonChartRow[];
  /** Column key (s0, s1 …: site names may hold dots that chart keys would read as paths). */
  series: { key: string; name: string }[];
}

export function seasonSiteTable(
  trials: readonly VarietyTrial[],
  traitKey: string,
  factor: number,
): SeasonChartTable {
  const measured = trials.filter((t) => t.traits.some((x) => x.key === traitKey));
  const sites = [
    ...new Set(
      measured.flatMap((t) => t.traits.find((x) => x.key === traitKey)!.sites.map((s) => s.site)),
    ),
  ];
  const series = sites.map((name, i) => ({ key: `s${i}`, name }));
  // A season with more than one planting names each trial, so no two rows share a label.
  const perSeason = new Map<string, number>();
  for (const t of measured) perSeason.set(t.season, (perSeason.get(t.season) ?? 0) + 1);
  const rows = measured.map((t) => {
    const trait = t.traits.find((x) => x.key === traitKey)!;
    const row: SeasonChartRow = {
      label: perSeason.get(t.season)! > 1 ? `${t.season} · ${t.title}` : t.season,
    };
    const decimals = decimalsInUnit(trait.decimals, factor);
    sites.forEach((site, i) => {
      const mean = trait.sites.find((s) => s.site === site)?.mean;
      row[`s${i}`] = mean === undefined ? null : roundTo(mean * factor, decimals);
    });
    return row;
  });
  return { rows, series };
}

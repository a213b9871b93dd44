/**
 * The comparison charts' data: one table per chart (one row per axis category, one column per
 * entry), so the category axis is the rows in order: dates sorted, sites in the order given.
 * Lines with their own data would make the axis the union of their categories in order of first
 * appearance, which puts late dates at the end and can lose a category. Pure.
 */
import type { EntrySite, HarvestCurve } from '@common/contracts/comparison';

export type ChartRow = Record<string, string | number | null>;
export interface ChartTable {
  rows: ChartRow[];
  /** Column key (e0, e1 …: entry names may hold dots that chart keys would read as paths). */
  series: { key: string; name: string }[];
}

/**
 * Cumulative harvest per entry on every harvest date of the trial, dates in calendar order.
 * Between an entry's own harvests its total stays where it was (0 before its first).
 */
export function harvestCurveTable(curve: HarvestCurve, factor: number): ChartTable {
  const dates = [...new Set(curve.entries.flatMap((e) => e.points.map((p) => p.date)))].sort();
  const series = curve.entries.map((e, i) => ({ key: `e${i}`, name: e.entry }));
  const rows = dates.map((date) => {
    const row: ChartRow = { date };
    curve.entries.forEach((e, i) => {
      let total = 0;
      for (const p of e.points) if (p.date <= date) total = p.cumulativeMassG;
      row[`e${i}`] = total * factor;
    });
    return row;
  });
  return { rows, series };
}

/** Entry means at each site, sites in the order the cells first name them. */
export function entrySiteTable(data: EntrySite, factor: number): ChartTable {
  const sites = [...new Set(data.cells.map((c) => c.site))];
  const entries = [...new Set(data.cells.map((c) => c.entry))];
  const series = entries.map((name, i) => ({ key: `e${i}`, name }));
  const rows = sites.map((site) => {
    const row: ChartRow = { site };
    entries.forEach((entry, i) => {
      const cell = data.cells.find((c) => c.entry === entry && c.site === site);
      row[`e${i}`] = cell ? cell.mean * factor : null;
    });
    return row;
  });
  return { rows, series };
}

/** Numbers the comparison charts need beyond the per-trait analysis; computed here, not in the browser. */
import { mean } from 'simple-statistics';
import type { EntrySite, HarvestCurve } from '../../common/contracts/comparison';
import type { TrialAnalysisQuery } from '../../common/contracts/analysis';
import type { Actor } from '../../common/policy';
import type { DB } from '../../db/database';
import { trialAnalysis } from '../analysis/analysis-service';
import { trialForAction } from '../trials/trials-service';

export async function harvestCurve(
  db: DB,
  slug: string,
  actor: Actor | null,
): Promise<HarvestCurve> {
  const { trial } = await trialForAction(db, slug, actor, 'trial.read');
  const [plots, harvests] = await Promise.all([
    db
      .selectFrom('plots as p')
      .innerJoin('entries as e', 'e.id', 'p.entry_id')
      .select(['p.id', 'e.name', 'e.code'])
      .where('p.trial_id', '=', trial.id)
      .execute(),
    db
      .selectFrom('harvests')
      .select(['plot_id', 'harvested_on', 'mass_g'])
      .where('trial_id', '=', trial.id)
      .where('deleted_at', 'is', null)
      .where('grade', '=', 'marketable')
      .orderBy('harvested_on')
      .execute(),
  ]);
  const entryOf = new Map(plots.map((p) => [p.id, p]));
  const plotsPerEntry = new Map<string, number>();
  for (const p of plots) plotsPerEntry.set(p.name, (plotsPerEntry.get(p.name) ?? 0) + 1);
  const byEntryDate = new Map<string, Map<string, number>>();
  for (const h of harvests) {
    const e = entryOf.get(h.plot_id);
    if (!e) continue;
    const dates = byEntryDate.get(e.name) ?? new Map<string, number>();
    dates.set(h.harvested_on, (dates.get(h.harvested_on) ?? 0) + h.mass_g);
    byEntryDate.set(e.name, dates);
  }
  const entries = [...new Map(plots.map((p) => [p.name, p.code])).entries()].map(
    ([entry, code]) => {
      const dates = [...(byEntryDate.get(entry) ?? new Map<string, number>()).entries()].sort(
        ([a], [b]) => a.localeCompare(b),
      );
      let total = 0;
      const perPlot = plotsPerEntry.get(entry) ?? 1;
      return {
        entry,
        code,
        points: dates.map(([date, g]) => ({ date, cumulativeMassG: (total += g) / perPlot })),
      };
    },
  );
  return { unit: 'g', entries: entries.sort((a, b) => a.code.localeCompare(b.code)) };
}

export async function entryBySite(
  db: DB,
  slug: string,
  actor: Actor | null,
  query: Required<Pick<TrialAnalysisQuery, 'trait' | 'basis'>>,
): Promise<EntrySite> {
  const result = await trialAnalysis(db, slug, actor, {
    trait: query.trait,
    basis: query.basis ?? 'plot',
    alpha: 0.05,
    letters: 'hsd',
  });
  const groups = new Map<string, { entry: string; site: string; values: number[] }>();
  for (const v of result.plotValues) {
    const key = `${v.entry}\u0000${v.site}`;
    const g = groups.get(key) ?? { entry: v.entry, site: v.site ?? '', values: [] };
    g.values.push(v.value);
    groups.set(key, g);
  }
  return {
    unit: result.unit,
    cells: [...groups.values()].map((g) => ({
      entry: g.entry,
      site: g.site,
      mean: mean(g.values),
      n: g.values.length,
    })),
  };
}

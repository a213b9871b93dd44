/**
 * Fictional several-site trial for the benchmarks: entries × blocks × sites from a fixed seed,
 * with site, block and entry effects, optionally with a share of the plots missing.
 */
import { createRandom } from '../common/random.js';
import type { PlotRow } from '../server/analysis/engine/analyze.js';

export interface FictionalTrial {
  entries: number;
  blocks: number;
  sites: number;
  seed: number;
  /** Share of plots left out at random (default none). */
  missing?: number;
}

export function fictionalTrialRows(trial: FictionalTrial): PlotRow[] {
  const random = createRandom(trial.seed);
  const entryEffect = Array.from({ length: trial.entries }, () => random.normal(0, 3));
  const rows: PlotRow[] = [];
  for (let s = 0; s < trial.sites; s++) {
    const siteEffect = random.normal(0, 5);
    for (let b = 0; b < trial.blocks; b++) {
      const blockEffect = random.normal();
      for (let e = 0; e < trial.entries; e++) {
        const v = 40 + siteEffect + blockEffect + entryEffect[e]! + random.normal(0, 2);
        if (trial.missing && random.float() < trial.missing) continue;
        rows.push({
          site: `Site ${s + 1}`,
          block: `${b + 1}`,
          variety: `Trial line ${e + 1}`,
          value: v.toFixed(1),
        });
      }
    }
  }
  return rows;
}

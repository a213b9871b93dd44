/**
 * Benchmark: REML mixed model for one trait, 100 entries × 4 blocks × 6 sites with 5 % of the
 * plots missing (fictional data from a fixed seed), y ~ variety + (1|site) + (1|site:block).
 * Times the engine in-process, then the same fit with R's lme4::lmer timed in-process in one
 * R session (bench/mixed-model.R), and prints both with their ratio. R is needed only here.
 *   npm run bench:mixed
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fitReml, varietyTestContrasts } from '../server/analysis/engine/mixed-model.js';
import { analyzePlotRows } from '../server/analysis/engine/analyze.js';
import { writeCsv } from '../common/csv.js';
import { fictionalTrialRows } from './fictional-trial.js';

// Under 300 ms for a REML fit this size on this 2-core machine: the project's own target.
const TARGET_MS = 300;
const ENTRIES = 100;
const BLOCKS = 4;
const SITES = 6;
const MISSING = 0.05;
const RUNS = 9;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const rows = fictionalTrialRows({
  entries: ENTRIES,
  blocks: BLOCKS,
  sites: SITES,
  seed: 20261202,
  missing: MISSING,
});
const code = (values: string[]) => {
  const map = new Map<string, number>();
  return {
    cells: Int32Array.from(values, (v) =>
      map.has(v) ? map.get(v)! : (map.set(v, map.size), map.size - 1),
    ),
    levels: () => map.size,
  };
};
const variety = code(rows.map((r) => r.variety));
const site = code(rows.map((r) => r.site!));
const block = code(rows.map((r) => `${r.site}\u0000${r.block}`));
const y = Float64Array.from(rows, (r) => Number(r.value) - 40);
const input = {
  y,
  fixedCells: variety.cells,
  fixedLevels: variety.levels(),
  random: [] as { source: string; cells: Int32Array; levels: number }[],
};
const counts = new Array<number>(variety.levels()).fill(0);
for (const c of variety.cells) counts[c]!++;
input.random = [
  { source: 'site', cells: site.cells, levels: site.levels() },
  { source: 'site:block', cells: block.cells, levels: block.levels() },
];

const fitTimes: number[] = [];
const fullTimes: number[] = [];
let fit = fitReml(input);
for (let r = 0; r < RUNS; r++) {
  const t0 = performance.now();
  fit = fitReml(input);
  fit.waldF(varietyTestContrasts(counts));
  fitTimes.push(performance.now() - t0);
}
for (let r = 0; r < 3; r++) {
  const t0 = performance.now();
  analyzePlotRows(rows, { model: 'mixed' });
  fullTimes.push(performance.now() - t0);
}
const ours = median(fitTimes);
console.log(
  `plots: ${y.length} (${ENTRIES} entries × ${BLOCKS} blocks × ${SITES} sites, ${Math.round(MISSING * 100)} % missing)`,
);
console.log(
  `engine REML fit + Satterthwaite F: median ${ours.toFixed(1)} ms over ${RUNS} runs (target < ${TARGET_MS} ms) ${ours < TARGET_MS ? 'OK' : 'SLOW'}`,
);
console.log(
  `whole analyze --model mixed (with site:variety, means, letters): median ${median(fullTimes).toFixed(1)} ms`,
);
console.log(
  `variance components: ${fit.varianceComponents.map((c) => `${c.source} ${c.variance.toPrecision(6)}`).join(', ')}`,
);

const dir = mkdtempSync(path.join(tmpdir(), 'rowtally-bench-'));
try {
  const csv = path.join(dir, 'trial.csv');
  writeFileSync(
    csv,
    writeCsv(
      ['site', 'block', 'variety', 'value'],
      rows.map((r) => [r.site!, r.block!, r.variety, String(r.value)]),
    ),
  );
  const script = path.join(import.meta.dirname, 'mixed-model.R');
  const out = execFileSync('Rscript', [script, csv, String(RUNS)], { encoding: 'utf8' });
  const rMs = Number(/median_ms=([0-9.]+)/.exec(out)?.[1]);
  console.log(out.trim());
  console.log(`ratio engine / lmer: ${(ours / rMs).toFixed(2)}`);
} catch (err) {
  console.log(
    `lmer timing skipped: ${err instanceof Error ? err.message.split('\n')[0] : String(err)}`,
  );
} finally {
  rmSync(dir, { recursive: true, force: true });
}

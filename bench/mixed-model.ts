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
import { analyzePlotRows, type PlotRow } from '../server/analysis/engine/analyze.js';
import { writeCsv } from '../common/csv.js';

const TARGET_MS = 300;
const ENTRIES = 100;
const BLOCKS = 4;
const SITES = 6;
const MISSING = 0.05;
const RUNS = 9;

/** Small seeded generator (mulberry32) so every run fits the same data. */
function seeded(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function trialRows(seed: number): PlotRow[] {
  const rnd = seeded(seed);
  const normal = () => Math.sqrt(-2 * Math.log(1 - rnd())) * Math.cos(2 * Math.PI * rnd());
  const entryEffect = Array.from({ length: ENTRIES }, () => 3 * normal());
  const rows: PlotRow[] = [];
  for (let s = 0; s < SITES; s++) {
    const siteEffect = 5 * normal();
    for (let b = 0; b < BLOCKS; b++) {
      const blockEffect = normal();
      for (let e = 0; e < ENTRIES; e++) {
        const v = 40 + siteEffect + blockEffect + entryEffect[e]! + 2 * normal();
        if (rnd() < MISSING) continue;
        rows.push({
          site: `Site ${s + 1}`,
          block: `${s + 1}-${b + 1}`,
          variety: `Line ${e + 1}`,
          value: v.toFixed(1),
        });
      }
    }
  }
  return rows;
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const rows = trialRows(20261202);
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
const block = code(rows.map((r) => r.block!));
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

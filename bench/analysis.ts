/**
 * Benchmark: multisite analysis of one trait, 100 entries × 4 blocks × 6 sites (2400 plots),
 * fictional data from a fixed seed. Prints the median and p95 time per trait analysis, for the
 * complete layout and with one missing plot.
 *   npm run bench:analysis
 */
import { analyzePlotRows, type PlotRow } from '../server/analysis/engine/analyze.js';
import { fictionalTrialRows } from './fictional-trial.js';
import { closingVerdict, percentile, verdict } from './support/bench-app';

/** Median ms per trait analysis (complete; one plot missing): common practice (no source). */
const TARGET_MS = { complete: 5, missing: 20 } as const;
const ENTRIES = 100;
const BLOCKS = 4;
const SITES = 6;

/** Median and p95 of `runs` timed analyses after a warm-up. */
function time(label: string, data: PlotRow[], runs: number, warmUp: number): number {
  let check = 0;
  for (let i = 0; i < warmUp; i++) check += analyzePlotRows(data, { design: 'multisite' }).n;
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const r = analyzePlotRows(data, { design: 'multisite' });
    times.push(performance.now() - t0);
    check += r.n;
  }
  times.sort((a, b) => a - b);
  const median = percentile(times, 0.5);
  const p95 = percentile(times, 0.95);
  const last = analyzePlotRows(data, { design: 'multisite' });
  if (check !== (warmUp + runs) * last.n) throw new Error('unexpected plot count');
  console.log(`${label}: ${data.length} plots, ${last.method} path`);
  console.log(
    `  runs: ${runs} after ${warmUp} warm-up; median ${median.toFixed(2)} ms, p95 ${p95.toFixed(2)} ms`,
  );
  return median;
}

const rows = fictionalTrialRows({ entries: ENTRIES, blocks: BLOCKS, sites: SITES, seed: 20240611 });
console.log(
  `multisite analysis, ${ENTRIES} entries × ${BLOCKS} blocks × ${SITES} sites (median time per trait analysis)`,
);
const complete = time('complete layout', rows, 300, 30);
// One missing plot makes the layout non-orthogonal: blocks are absorbed and the variety
// systems solved (see server/analysis/engine/block-absorption.ts).
const missing = time('one missing plot', rows.slice(1), 100, 10);
const lines = [
  verdict('analysis complete layout, median ms', complete, TARGET_MS.complete, true),
  verdict('analysis one missing plot, median ms', missing, TARGET_MS.missing, true),
];
for (const line of lines) console.log(line);
console.log(closingVerdict('analysis', lines));

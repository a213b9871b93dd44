/**
 * Benchmark: the analysis engine against R on the same file, 200 entries × 4 complete blocks
 * (fictional, fixed seed), side by side in one run.
 *   1. In process: `analyzeCsv` on the file's text (reading the CSV, the analysis of variance,
 *      means, LSD and HSD with letters, ranks) against R's `summary(aov(value ~ block + variety))`
 *      on the data frame already read (the analysis of variance table only). Median of many
 *      timed repetitions each; rounds alternate so other load on the machine hits both alike.
 *   2. Whole process: the analyze command as built (`node dist/server/cli.js FILE`, JSON out)
 *      against `Rscript` reading the same file and printing the same aov table.
 * The engine's side does more work in both (the bench prints what); the ratios are not adjusted.
 * Skips with a message when Rscript is not installed.
 *   npm run bench:engine-vs-r
 */
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { writeCsv } from '../common/csv';
import { projectRoot } from '../server/env';
import { analyzeCsv } from '../server/analysis/engine/analyze';
import { fictionalTrialRows } from './fictional-trial';
import { median, verdict } from './support/bench-app';

const ENTRIES = 200;
const BLOCKS = 4;
const ROUNDS = 3;
const IN_PROCESS_REPS = 60;
const PROCESS_RUNS = 4;
/** Engine ÷ R time ratios at most these: our own targets, common practice (no source). */
const TARGET_IN_PROCESS = 0.15;
const TARGET_PROCESS = 0.6;

const rVersion = spawnSync('Rscript', ['--version'], { encoding: 'utf8' });
if (rVersion.error || rVersion.status !== 0) {
  console.log('Rscript is not installed: the engine is not compared with R on this machine.');
  console.log('engine-vs-r: skipped (no Rscript)');
  process.exit(0);
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'rowtally-engine-vs-r-'));
try {
  const file = path.join(dir, 'trial.csv');
  const rows = fictionalTrialRows({ entries: ENTRIES, blocks: BLOCKS, sites: 1, seed: 20261202 });
  const csv = writeCsv(
    ['variety', 'block', 'value'],
    rows.map((r) => [r.variety, r.block ?? '', String(r.value)]),
  );
  fs.writeFileSync(file, csv);
  const rEnv = { ...process.env, ROWTALLY_BENCH_FILE: file };

  // R in process: one Rscript reads the file once, then times aov + its table per repetition
  // and prints the times in ms.
  const rTimed = `
    d <- read.csv(Sys.getenv("ROWTALLY_BENCH_FILE"), colClasses = c("factor", "factor", "numeric"))
    fit <- function() summary(aov(value ~ block + variety, data = d))
    for (i in 1:5) invisible(fit())
    times <- numeric(${IN_PROCESS_REPS})
    for (i in seq_along(times)) {
      t0 <- Sys.time(); invisible(fit()); times[i] <- as.numeric(Sys.time() - t0, units = "secs") * 1000
    }
    cat(times, sep = "\\n")`;
  const rInProcess = () =>
    execFileSync('Rscript', ['-e', rTimed], { env: rEnv, encoding: 'utf8' })
      .trim()
      .split('\n')
      .map(Number);

  const text = fs.readFileSync(file, 'utf8');
  for (let i = 0; i < 20; i++) analyzeCsv(text);
  const engineInProcess = () => {
    const times: number[] = [];
    for (let i = 0; i < IN_PROCESS_REPS; i++) {
      const t0 = performance.now();
      analyzeCsv(text);
      times.push(performance.now() - t0);
    }
    return times;
  };

  // Whole process: the built command, and Rscript reading the file and printing the table.
  execFileSync('npm', ['run', '--silent', 'build:server'], { cwd: projectRoot, stdio: 'inherit' });
  const cli = path.join(projectRoot, 'dist/server/cli.js');
  const rWhole = `d <- read.csv(Sys.getenv("ROWTALLY_BENCH_FILE"), colClasses = c("factor", "factor", "numeric")); print(summary(aov(value ~ block + variety, data = d)))`;
  const timedRun = (command: string, args: string[]) => {
    const t0 = performance.now();
    const run = spawnSync(command, args, { env: rEnv, encoding: 'utf8' });
    const ms = performance.now() - t0;
    if (run.status !== 0) throw new Error(`${command} failed: ${run.stderr}`);
    return ms;
  };
  const check = JSON.parse(execFileSync(process.execPath, [cli, file], { encoding: 'utf8' })) as {
    n: number;
  };
  if (check.n !== ENTRIES * BLOCKS) throw new Error(`the command read ${check.n} plots`);

  const samples = {
    engine: [] as number[],
    r: [] as number[],
    cli: [] as number[],
    rscript: [] as number[],
  };
  for (let round = 0; round < ROUNDS; round++) {
    samples.engine.push(...engineInProcess());
    samples.r.push(...rInProcess());
    for (let i = 0; i < PROCESS_RUNS; i++) {
      samples.cli.push(timedRun(process.execPath, [cli, file]));
      samples.rscript.push(timedRun('Rscript', ['-e', rWhole]));
    }
  }
  const m = Object.fromEntries(Object.entries(samples).map(([k, v]) => [k, median(v)])) as Record<
    keyof typeof samples,
    number
  >;
  console.log(
    `engine vs R, ${ENTRIES} entries × ${BLOCKS} blocks, ${rVersion.stdout.trim() || rVersion.stderr.trim()}`,
  );
  console.log(
    `  in process (median of ${ROUNDS * IN_PROCESS_REPS}): engine ${m.engine.toFixed(2)} ms, R aov ${m.r.toFixed(2)} ms`,
  );
  console.log(
    `  whole process (median of ${ROUNDS * PROCESS_RUNS}): node dist/server/cli.js ${m.cli.toFixed(0)} ms, Rscript ${m.rscript.toFixed(0)} ms`,
  );
  // The two sides do not do the same work, and the difference is against the engine: say so
  // beside the figures rather than trim the engine's side.
  console.log(
    '  not the same work: in process the engine also reads the CSV text and gives means, LSD and HSD with letters for both, ranks and adjusted means; R times aov and its table on a data frame already read',
  );
  console.log(
    '  whole process: the command prints the full analysis as JSON; Rscript prints the aov table',
  );
  const lines = [
    verdict('engine-vs-r in process', m.engine / m.r, TARGET_IN_PROCESS, true),
    verdict('engine-vs-r analyze command ÷ Rscript', m.cli / m.rscript, TARGET_PROCESS, true),
  ];
  for (const line of lines) console.log(line);
  const met = lines.filter((l) => l.endsWith(') met')).length;
  console.log(
    `engine-vs-r: ratio ${met}/${lines.length} targets (target ${lines.length}/${lines.length}) ${met === lines.length ? 'met' : 'NOT met'}`,
  );
} finally {
  fs.rmSync(dir, { recursive: true, force: true });
}

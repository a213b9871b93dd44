/**
 * npm test: installs the Debian packages the tests need when missing (PostgreSQL, Chromium, nginx),
 * builds the client for the browser tests, then runs every test. The throwaway database is
 * started and stopped by the tests' global setup (tests/setup/global-db.ts).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { ensureSystemPackages } from './system-packages';
import { summarizeTestRun, type VitestJsonReport } from './test-summary';

const artifacts = path.resolve('.test-artifacts');
fs.mkdirSync(artifacts, { recursive: true });

try {
  ensureSystemPackages(['postgresql', 'chromium', 'poppler-utils', 'nginx']);
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}

const run = (args: string[], nodeEnv = 'test') =>
  spawnSync(process.execPath, args, {
    stdio: 'inherit',
    env: { ...process.env, NODE_ENV: nodeEnv },
  });

// The browser tests drive the client as it ships: a production build (under NODE_ENV=test,
// React and the router would be built in their development form, three times the size).
console.log('Building the client for the browser tests…');
if (
  run(['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], 'production').status !== 0
)
  process.exit(1);

const results = path.join(artifacts, 'vitest-results.json');
fs.rmSync(results, { force: true });
const vitest = run([
  'node_modules/vitest/vitest.mjs',
  'run',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${results}`,
  ...process.argv.slice(2),
]);

// One plain closing line that any CI can read; the run fails when the runner says it failed,
// even if no single test did (a file that does not load has no failing test).
const report = fs.existsSync(results)
  ? (JSON.parse(fs.readFileSync(results, 'utf8')) as VitestJsonReport)
  : null;
const summary = summarizeTestRun(report);
for (const file of summary.brokenFiles) console.log(`\n${file.name}: ${file.message}`);
console.log(`\n${summary.line}`);
process.exit(summary.ok && vitest.status === 0 ? 0 : vitest.status || 1);

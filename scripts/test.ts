/**
 * npm test: installs the Debian packages the tests need when missing (PostgreSQL, Chromium),
 * builds the client for the browser tests, then runs every test. The throwaway database is
 * started and stopped by the tests' global setup (tests/setup/global-db.ts).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { ensureSystemPackages } from './system-packages';

const artifacts = path.resolve('.test-artifacts');
fs.mkdirSync(artifacts, { recursive: true });

try {
  ensureSystemPackages(['postgresql', 'chromium', 'poppler-utils']);
} catch (err) {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
}

const run = (args: string[]) =>
  spawnSync(process.execPath, args, {
    stdio: 'inherit',
    env: { ...process.env, NODE_ENV: 'test' },
  });

console.log('Building the client for the browser tests…');
if (run(['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn']).status !== 0)
  process.exit(1);

const results = path.join(artifacts, 'vitest-results.json');
const vitest = run([
  'node_modules/vitest/vitest.mjs',
  'run',
  '--reporter=default',
  '--reporter=json',
  `--outputFile.json=${results}`,
  ...process.argv.slice(2),
]);

// One plain closing line that any CI can read.
if (fs.existsSync(results)) {
  const r = JSON.parse(fs.readFileSync(results, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    numPendingTests: number;
  };
  console.log(
    `\nTests: ${r.numPassedTests} passed, ${r.numFailedTests} failed, ${r.numPendingTests} skipped`,
  );
}
process.exit(vitest.status ?? 1);

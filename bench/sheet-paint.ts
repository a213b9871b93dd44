/**
 * Benchmark: the largest contentful paint of a published results sheet against the sign-in
 * page's, each opened cold (a new browser context, nothing cached) in Debian's Chromium, in
 * alternating rounds in one run, served by the production server as built.
 *   npm run bench:sheet-paint
 * The sheet's page arrives drawn by the server, so its paint needs no script; the sign-in page
 * is drawn by the client. Target: the sheet paints no later than the sign-in page (ratio ≤ 1).
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { projectRoot } from '../server/env';
import {
  buildServer,
  insertBenchTrial,
  median,
  signedInLead,
  startBenchDatabase,
  startBenchServer,
  verdict,
} from './support/bench-app';

const TARGET = 1;
const ROUNDS = 7;

/** The client and the sheet's server renderer, built as `npm run build` makes them. */
function buildClientIfMissing(): void {
  const built = ['dist/client/index.html', 'dist/sheet-html/entry-sheet-html.js'];
  if (built.every((f) => fs.existsSync(path.join(projectRoot, f)))) return;
  execFileSync(process.execPath, ['node_modules/vite/bin/vite.js', 'build', '--logLevel', 'warn'], {
    cwd: projectRoot,
    stdio: 'inherit',
  });
}

/** The page's largest contentful paint in ms, once what shows it is on screen. */
async function largestPaint(browser: Browser, url: string, shown: (page: Page) => Promise<void>) {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  await page.goto(url);
  await shown(page);
  // Later, larger paints would replace the candidate: give the page a moment to finish.
  await page.waitForTimeout(300);
  const lcp = await page.evaluate(
    () =>
      new Promise<number>((resolve) => {
        new PerformanceObserver((list) => {
          const entries = list.getEntries();
          resolve(entries[entries.length - 1]!.startTime);
        }).observe({ type: 'largest-contentful-paint', buffered: true });
      }),
  );
  await context.close();
  return lcp;
}

buildClientIfMissing();
const database = await startBenchDatabase();
buildServer();
const server = await startBenchServer(database.url);
const browser = await chromium.launch({
  executablePath: '/usr/bin/chromium',
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run'],
});
try {
  const lead = await signedInLead(database.db, server.origin);
  const trial = await insertBenchTrial(database.db, {
    slug: 'bench-sheet',
    leadId: lead.userId,
    entries: 12,
    blocks: 4,
    sites: 1,
    harvestsPerPlot: 3,
  });
  const published = await fetch(`${server.origin}/api/trials/${trial.slug}/results-sheet/publish`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Cookie: lead.cookie, Origin: server.origin },
    body: JSON.stringify({ changeNote: '' }),
  });
  if (published.status !== 201) throw new Error(`publish failed: ${await published.text()}`);

  const signIn = () =>
    largestPaint(browser, `${server.origin}/sign-in`, (page) =>
      page.getByRole('button', { name: 'Sign in' }).waitFor(),
    );
  const sheet = () =>
    largestPaint(browser, `${server.origin}/r/${trial.slug}`, (page) =>
      page.getByRole('button', { name: 'Print' }).waitFor(),
    );
  await signIn();
  await sheet();
  const signInTimes: number[] = [];
  const sheetTimes: number[] = [];
  for (let i = 0; i < ROUNDS; i++) {
    signInTimes.push(await signIn());
    sheetTimes.push(await sheet());
  }
  const ms = (xs: number[]) => xs.map((x) => x.toFixed(0)).join(' / ');
  console.log(`largest contentful paint, cold, ${ROUNDS} alternating rounds (ms)`);
  console.log(
    `  sign-in page:          ${ms(signInTimes)} (median ${median(signInTimes).toFixed(0)})`,
  );
  console.log(
    `  published sheet page:  ${ms(sheetTimes)} (median ${median(sheetTimes).toFixed(0)})`,
  );
  console.log(verdict('sheet-paint', median(sheetTimes) / median(signInTimes), TARGET, true));
} finally {
  await browser.close();
  await server.stop();
  await database.stop();
}

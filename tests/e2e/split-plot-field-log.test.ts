// The field log of the fertilizer × variety split plot in Debian's Chromium, at 360 px and on
// desktop: each plot on the picker's grid and the plot being logged name the plot's level of the
// fertilizer, as the stored layout gives it (the plots table), under the treatment's name.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { SPLIT_PLOT_SLUG, seedSplitPlotTrial } from '../../db/seed/demo-split-plot';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  type LiveApp,
  openBrowserSuite,
  screenshot,
  watchErrors,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
// The grower who logs this trial (a member of it in the demo).
const grower = demoAccounts.find((a) => a.key === 'grower2')!;
let plots: { plot_number: number; treatment: string | null }[];

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  await seedSplitPlotTrial(live.db);
  plots = await live.db
    .selectFrom('plots as p')
    .innerJoin('trials as t', 't.id', 'p.trial_id')
    .select(['p.plot_number', 'p.treatment'])
    .where('t.slug', '=', SPLIT_PLOT_SLUG)
    .orderBy('p.plot_number')
    .execute();
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

describe('the field log of a split-plot trial', () => {
  it('names each plot’s fertilizer level on the grid and in the plot being logged', async () => {
    const first = plots[0]!;
    const other = plots.find((p) => p.treatment !== first.treatment)!;
    expect(first.treatment).toBeTruthy();
    expect(other.treatment).toBeTruthy();
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await contextAs(browser, live, grower, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/t/${SPLIT_PLOT_SLUG}/log`);
      await page.getByRole('heading', { level: 1, name: 'Field log' }).waitFor();
      const heading = page.getByRole('heading', {
        name: new RegExp(`^Plot ${first.plot_number} · `),
      });
      await heading.waitFor();
      await expect(heading.textContent()).resolves.toMatch(
        new RegExp(`, block \\d+, Fertilizer: ${first.treatment}\\)$`),
      );
      // Every plot on the grid says its level in its name (and shows it under the entry code).
      const grid = page.getByRole('region', { name: 'Plots by block' });
      for (const p of plots) {
        await grid
          .getByRole('button', {
            name: new RegExp(`^Plot ${p.plot_number}\\D.*, Fertilizer: ${p.treatment}$`),
          })
          .waitFor();
      }
      await grid.getByRole('button', { name: new RegExp(`^Plot ${other.plot_number}\\D`) }).click();
      const next = page.getByRole('heading', {
        name: new RegExp(`^Plot ${other.plot_number} · `),
      });
      await next.waitFor();
      await expect(next.textContent()).resolves.toContain(`Fertilizer: ${other.treatment})`);
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `split-plot-field-log-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });
});

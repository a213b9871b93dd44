// The fertilizer × variety split plot's analysis page in Debian's Chromium, at 360 px and on
// desktop: the strata, the interaction plot and its table alternative; then its published sheet
// (drawn by the server, then in the browser) with the fertilizer's cells; and, once a plot's
// record is withdrawn, the mixed model the analysis page then shows instead of the strata.
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
  publishAs,
  screenshot,
  watchErrors,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  await seedSplitPlotTrial(live.db);
  await publishAs(live, lead.email, SPLIT_PLOT_SLUG);
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

describe('a split-plot trial', () => {
  it('shows the strata, the interaction plot and the simple effects at 360 px and on desktop', async () => {
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/t/${SPLIT_PLOT_SLUG}`);
      await page.getByRole('link', { name: 'Analysis', exact: true }).click();
      await page.getByRole('heading', { level: 1, name: 'Analysis' }).waitFor();
      const anova = page.getByRole('table', { name: /Analysis of variance: Days to first pods/ });
      await anova.waitFor();
      // aov(value ~ block + treatment * variety + Error(block/treatment)) strata.
      await expect(anova.getByRole('rowheader').allTextContents()).resolves.toEqual([
        // One site: plain blocks; the treatment under the trial's own name for it.
        'Block',
        'Fertilizer',
        'Block × fertilizer (main-plot error)',
        'Variety',
        'Variety × fertilizer',
        'Residual',
        'Total',
      ]);
      const treatmentRow = anova.getByRole('row').filter({ hasText: /^Fertilizer/ });
      await expect(treatmentRow.textContent()).resolves.toContain(
        'Block × fertilizer (main-plot error)',
      );
      await page.locator('[data-strata="split-plot"]').waitFor();
      // The interaction plot is drawn (one line per variety), with its table beside it.
      const plot = page.getByRole('img', { name: /Interaction plot of Days to first pods/ });
      await plot.waitFor();
      await plot.locator('.recharts-line').first().waitFor();
      await expect(plot.locator('.recharts-line').count()).resolves.toBe(4);
      const cells = page.getByRole('table', { name: /Cell means: variety × fertilizer/ });
      // Days from sowing carry their unit, the same in metric and US customary.
      await expect(cells.getByRole('columnheader').allTextContents()).resolves.toEqual([
        'Variety',
        'none (d)',
        'pre-plant (d)',
        'Variety mean (d)',
      ]);
      const effects = page.getByRole('table', { name: /Fertilizer within each variety/ });
      await expect(effects.getByRole('rowheader').allTextContents()).resolves.toEqual([
        'Corvale Prime',
        'Greywater Runner',
        'Mossbank Wax',
        'Tansy Purple',
      ]);
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `split-plot-analysis-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('publishes a sheet that shows the fertilizer cells and the interaction at 360 px and on desktop', async () => {
    // The server draws the sheet before any script runs: the cells are in the page itself.
    const html = (await (await fetch(`${live.url}/r/${SPLIT_PLOT_SLUG}`)).text()).replace(
      /<!-- -->/g,
      '',
    );
    expect(html).toContain('Cell means: Days to first pods (d), variety × fertilizer');
    expect(html).toContain('data-strata="split-plot"');
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await browser.newContext({ baseURL: live.url, viewport });
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/r/${SPLIT_PLOT_SLUG}`);
      await page.getByRole('heading', { level: 1 }).waitFor();
      const cells = page.getByRole('table', {
        name: /Cell means: Days to first pods \(d\), variety × fertilizer/,
      });
      await cells.waitFor();
      await expect(cells.getByRole('columnheader').allTextContents()).resolves.toEqual([
        expect.stringMatching(/^Variety/),
        expect.stringMatching(/^none/),
        expect.stringMatching(/^pre-plant/),
        expect.stringMatching(/^Over all levels/),
      ]);
      await expect(cells.getByRole('rowheader').count()).resolves.toBe(4);
      await page.getByText(/^Variety × fertilizer: F\(3, 18\) = [\d.]+, p < 0\.001$/).waitFor();
      await page.getByText(/^Fertilizer means: none /).waitFor();
      await page
        .getByText('Entries are ranked on their means over all levels of fertilizer', {
          exact: false,
        })
        .waitFor();
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `split-plot-sheet-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('with a plot lost, shows the mixed model, its tests and variances at both widths', async () => {
    const trial = await live.db
      .selectFrom('trials')
      .select('id')
      .where('slug', '=', SPLIT_PLOT_SLUG)
      .executeTakeFirstOrThrow();
    const plot = await live.db
      .selectFrom('plots')
      .select('id')
      .where('trial_id', '=', trial.id)
      .orderBy('plot_number')
      .executeTakeFirstOrThrow();
    await live.db
      .updateTable('observations')
      .set({ deleted_at: new Date() })
      .where('plot_id', '=', plot.id)
      .where('deleted_at', 'is', null)
      .execute();
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/t/${SPLIT_PLOT_SLUG}/analysis`);
      await page.getByRole('heading', { level: 1, name: 'Analysis' }).waitFor();
      await page.locator('[data-model="mixed"]').waitFor();
      await expect(page.getByRole('combobox', { name: /^Model/ }).inputValue()).resolves.toBe(
        'mixed',
      );
      const tests = page.getByRole('table', { name: /Wald F tests/ });
      await expect(tests.getByRole('rowheader').allTextContents()).resolves.toEqual([
        'Fertilizer',
        'Variety',
        'Variety × fertilizer',
      ]);
      const components = page.getByRole('table', { name: /Variance components/ });
      await expect(components.getByRole('rowheader').allTextContents()).resolves.toEqual([
        'Blocks',
        'Main plots (block × fertilizer)',
        'Plot to plot (residual)',
      ]);
      await expect(
        page.getByText(/1 missing plot: the split plot's classical strata/).count(),
      ).resolves.toBe(1);
      await expect(
        page.getByRole('table', { name: /Analysis of variance: Days to first pods/ }).count(),
      ).resolves.toBe(0);
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `split-plot-mixed-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });
});

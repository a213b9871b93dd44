// The analysis screens in Debian's Chromium against the built app and the demo season.
import { readFileSync } from 'node:fs';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import {
  closeBrowserSuite,
  contextAs,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  watchErrors,
  expectNoSeriousA11yViolations,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
});
afterAll(() => closeBrowserSuite(live, browser));

describe('analysis screens', () => {
  it('the lead sees the demo trial’s ANOVA, letters and ranking at 360 px and on desktop', async () => {
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto('/t/larkhaven-okra-2026');
      await page.getByRole('link', { name: 'Analysis', exact: true }).click();
      await page.getByRole('heading', { level: 1, name: 'Analysis' }).waitFor();
      const anova = page.getByRole('table', { name: /Analysis of variance: Marketable yield/ });
      await anova.waitFor();
      // Multisite layout: site, block within site, variety, site × variety, residual, total.
      await expect(anova.getByRole('rowheader').allTextContents()).resolves.toEqual([
        'Site',
        'Block (within site)',
        'Variety',
        'Site × variety',
        'Residual',
        'Total',
      ]);
      const means = page.getByRole('table', { name: /Entry means: Marketable yield/ });
      // Tallow Creek Green leads the demo season's marketable yield with letter a.
      const first = means.getByRole('row').nth(1);
      await expect(first.getByRole('rowheader').textContent()).resolves.toContain(
        'Tallow Creek Green',
      );
      await expect(first.locator('[data-letters]').textContent()).resolves.toBe('a');
      // Several sites: the page opens on the mixed model and shows its variance components.
      const model = page.getByRole('combobox', { name: /^Model/ });
      await expect(model.inputValue()).resolves.toBe('mixed');
      await page.getByRole('table', { name: /Variance components/ }).waitFor();
      await expect(page.getByRole('region', { name: 'Model used' }).textContent()).resolves.toMatch(
        /Satterthwaite/,
      );
      await page.getByRole('table', { name: /Weighted index/ }).waitFor();
      await page.getByRole('table', { name: /Degree days, hot days and water/ }).waitFor();
      // Tables scroll inside their own box; the page does not scroll sideways.
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `analysis-trial-${viewport.width}`);

      // The lead switches to the classical analysis: the variance components go.
      await model.selectOption('anova');
      await page.getByRole('table', { name: /Variance components/ }).waitFor({ state: 'detached' });
      await expect(page.url()).toContain('model=anova');
      await model.selectOption('mixed');
      await page.getByRole('table', { name: /Variance components/ }).waitFor();

      // On request, varieties as random: the heritability and BLUPs the API gives.
      await page.getByRole('button', { name: 'Estimate heritability' }).click();
      const blups = page.getByRole('table', {
        name: /Predicted entry means with varieties random/,
      });
      await blups.waitFor();
      const api = await page.request.get(
        '/api/trials/larkhaven-okra-2026/analysis?trait=marketable_yield&model=mixed&varietiesRandom=true',
      );
      const random = (await api.json()).varietiesRandom as {
        heritability: number;
        blups: { variety: string }[];
      };
      await expect(
        page.locator('[data-heritability]').getAttribute('data-heritability'),
      ).resolves.toBe(String(random.heritability));
      await expect(blups.getByRole('rowheader').allTextContents()).resolves.toEqual(
        random.blups.map((b) => b.variety),
      );
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        viewport.width,
      );
      await expectNoSeriousA11yViolations(page);

      // Choosing another trait by keyboard recomputes.
      await page.getByLabel('Trait', { exact: true }).selectOption('heat_tolerance');
      await page.getByRole('table', { name: /Analysis of variance: Heat tolerance/ }).waitFor();
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('the spreadsheet page shows the same variety F as the command for a pasted CSV', async () => {
    const csv = readFileSync('fixtures/analysis/multisite-missing.csv', 'utf8');
    const expected = analyzeCsv(csv).anova.find((l) => l.source === 'variety')!.f!;
    const context = await contextAs(browser, live, lead, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto('/');
    await page.getByRole('link', { name: 'Analyze a spreadsheet' }).click();
    await page.getByRole('heading', { level: 1, name: 'Analyze a spreadsheet' }).waitFor();
    await page.getByLabel('Or paste the spreadsheet (CSV)').fill(csv);
    // The columns are guessed from the header.
    await expect(page.getByLabel('Variety (entry) column').inputValue()).resolves.toBe('variety');
    await expect(page.getByLabel('Value column (the trait)').inputValue()).resolves.toBe('value');
    await page.getByRole('button', { name: 'Analyze' }).click();
    const anova = page.getByRole('table', { name: /Analysis of variance: value/ });
    await anova.waitFor();
    const varietyRow = anova
      .getByRole('row')
      .filter({ has: page.getByRole('rowheader', { name: 'Variety', exact: true }) });
    await expect(varietyRow.locator('[data-f]').textContent()).resolves.toBe(expected.toFixed(2));
    await page
      .getByText(/missing plot/)
      .first()
      .waitFor();
    await page.getByRole('button', { name: 'Download results (JSON)' }).waitFor();
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(scrollWidth).toBeLessThanOrEqual(360);
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'analysis-spreadsheet-360');
    expect(errors).toEqual([]);
    await context.close();
  });
});

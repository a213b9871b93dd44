// The demo's volunteer network (db/seed/demo-network.ts) in Debian's Chromium: its layout page
// reports how evenly entries share gardens, and its analysis page opens on the mixed model with
// gardens random. The figures on the page are checked against R (lme4/lmerTest/emmeans) in
// fixtures/analysis/mixed-demo-network.json, where the exact call and versions are stored.
import { readFileSync } from 'node:fs';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { describePlan } from '../../common/incomplete-blocks';
import {
  NETWORK_SLUG,
  networkEntries,
  networkLayout,
  seedNetworkTrial,
} from '../../db/seed/demo-network';
import { demoAccounts } from '../../db/seed/demo-season';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  openBrowserSuite,
  screenshot,
  watchErrors,
  type LiveApp,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;
const ref = JSON.parse(readFileSync('fixtures/analysis/mixed-demo-network.json', 'utf8')) as {
  varianceComponents: { source: string; variance: number }[];
  adjustedMeans: { variety: string; mean: number }[];
};
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
// What the layout page should report, from the pure plan the demo was laid out with.
const plan = describePlan(
  networkLayout().map((p) => ({ block: p.siteId, entry: p.entryId, replicate: p.replicate! })),
  networkEntries.map((e) => e.code).sort(),
);

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  // The browser suite loads the current season only; the network joins it as on a fresh start.
  await seedNetworkTrial(live.db);
});
afterAll(() => closeBrowserSuite(live, browser));

describe('a volunteer network with incomplete blocks', () => {
  it('shows pair concurrence on the layout and the mixed model on the analysis, at 360 px and on desktop', async () => {
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);

      await page.goto(`/t/${NETWORK_SLUG}/layout`);
      const balance = page.getByRole('region', { name: 'How evenly entries meet' });
      await balance.waitFor();
      await expect(balance.getByRole('definition').first().textContent()).resolves.toBe(
        `${plan.concurrenceMin} to ${plan.concurrenceMax}`,
      );
      await expect(balance.textContent()).resolves.toContain('20 gardens of 4 entries each');
      await expect(page.getByLabel('Entries each garden grows').inputValue()).resolves.toBe('4');
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        viewport.width,
      );
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `network-layout-${viewport.width}`);

      await page.goto(`/t/${NETWORK_SLUG}/analysis`);
      await page.getByRole('heading', { level: 1, name: 'Analysis' }).waitFor();
      const model = page.getByRole('combobox', { name: /^Model/ });
      await expect(model.inputValue()).resolves.toBe('mixed');
      await expect(
        page.getByRole('note').filter({ hasText: 'Why the mixed model' }).textContent(),
      ).resolves.toMatch(/Each garden grows only some of the entries/);
      const components = page.getByRole('table', { name: /Variance components/ });
      await components.waitFor();
      await expect(components.getByRole('rowheader').allTextContents()).resolves.toEqual([
        'Gardens (sites)',
        'Plot to plot (residual)',
      ]);
      const shown = await components
        .locator('[data-variance]')
        .evaluateAll((cells) => cells.map((c) => Number(c.getAttribute('data-variance'))));
      ref.varianceComponents.forEach((c, i) =>
        expect(rel(shown[i]!, c.variance)).toBeLessThan(5e-5),
      );
      // The best BLUE heads the means table, with R's estimate.
      const best = [...ref.adjustedMeans].sort((a, b) => b.mean - a.mean)[0]!;
      const means = page.getByRole('table', { name: /Entry means: Fresh pod yield/ });
      const first = means.getByRole('row').nth(1);
      await expect(first.getByRole('rowheader').textContent()).resolves.toContain(best.variety);
      const blue = Number(await first.locator('[data-adjusted]').getAttribute('data-adjusted'));
      expect(rel(blue, best.mean)).toBeLessThan(1e-6);
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        viewport.width,
      );
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `network-analysis-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  }, 180_000);
});

/**
 * Varieties across seasons, in the browser: from the okra trial's entry list the lead opens a
 * variety, sees its record across the demo's two okra seasons (table and chart, one line per
 * site), then compares it with other varieties across seasons, where a pair that never shared a
 * trial is marked and the crop's stability figures show with what a slope means. At 360 px and
 * on desktop, with the axe check on each page. The numbers on screen are checked against the
 * API's answers (whose figures are checked against the trials' own analyses in the API tests),
 * in the reader's unit through the one display-units module.
 */
import { displayUnit, formatInUnit, typicalOf } from '@common/display-units';
import type { Browser } from 'playwright-core';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedEarlierSeasons } from '../../db/seed/seed';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  watchErrors,
} from '../support/browser';
import { mintSessionCookie } from '../support/test-app';

let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  await seedEarlierSeasons(live.db);
}, 180_000);
afterAll(() => closeBrowserSuite(live, browser));

describe('a variety across seasons', () => {
  it.each([
    ['360 px', { width: 360, height: 780 }],
    ['desktop', { width: 1280, height: 900 }],
  ] as const)(
    'from the entry list to its record, then compared across seasons (%s)',
    async (name, viewport) => {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      const noSidewaysScroll = async () =>
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
          viewport.width,
        );

      // The trial's entry list links each entry to its register variety.
      await page.goto('/t/larkhaven-okra-2026');
      await page.getByRole('link', { name: 'Velvet Lantern', exact: true }).click();
      await page.waitForURL('**/varieties/velvet-lantern');
      await page.getByRole('heading', { level: 1, name: 'Velvet Lantern' }).waitFor();

      // Its record across the two okra seasons.
      await page.getByRole('heading', { name: 'Grown in 2 trials over 2 seasons' }).waitFor();
      const figures = page.getByRole('region', { name: 'Figures season by season' });
      await figures
        .getByRole('link', { name: 'Larkhaven heirloom okra, first season' })
        .first()
        .waitFor();
      await figures
        .getByRole('link', { name: 'Larkhaven heirloom okra, three gardens' })
        .first()
        .waitFor();
      const cookie = await mintSessionCookie(live, lead);
      const record = (
        await request(live.app).get('/api/varieties/velvet-lantern').set('Cookie', cookie)
      ).body as {
        trials: {
          season: string;
          traits: {
            key: string;
            mean: number;
            rank: number;
            entryCount: number;
            unit: string;
            decimals: number;
          }[];
        }[];
      };
      expect(record.trials.map((t) => t.season)).toEqual(['2025', '2026']);
      // The 2025 marketable yield row shows the API's mean in the record's one unit, and its rank.
      const yields = record.trials.map((t) => t.traits.find((x) => x.key === 'marketable_yield')!);
      const unit = displayUnit('g', 'metric', typicalOf(yields.map((y) => y.mean)));
      // A phone shows a card per trial with a line per trait; a wider screen the table's rows.
      const row2025 =
        viewport.width < 640
          ? figures
              .getByRole('listitem')
              .filter({ hasText: 'first season' })
              .first()
              .getByRole('listitem')
              .filter({ hasText: 'Marketable yield' })
          : figures
              .getByRole('row')
              .filter({ hasText: 'first season' })
              .filter({ hasText: 'Marketable yield' });
      await row2025.waitFor();
      const text = await row2025.innerText();
      expect(text).toContain(formatInUnit(yields[0]!.mean, unit, yields[0]!.decimals));
      expect(text).toContain(`${yields[0]!.rank} of ${yields[0]!.entryCount}`);
      if (viewport.width < 640) {
        // No table at this width, and a card no taller than a few lines per trait.
        expect(await page.getByRole('table').count()).toBe(0);
        expect((await row2025.boundingBox())!.height).toBeLessThan(160);
      }
      // The chart: the trait over seasons, one line per garden.
      const chart = page.locator('figure').filter({ hasText: 'one line per site' });
      await chart.locator('.recharts-line').first().waitFor();
      expect(await chart.locator('.recharts-line').count()).toBe(3);
      await noSidewaysScroll();
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `variety-record-${name.replace(' ', '-')}`);

      // Compare across seasons: with Mossbank Long (both seasons) and two varieties of one season each.
      await page.getByRole('link', { name: 'Compare with other varieties' }).click();
      await page
        .getByRole('heading', { level: 1, name: 'Compare varieties across seasons' })
        .waitFor();
      await page.getByText('Choose at least two varieties.').waitFor();
      for (const other of ['Mossbank Long', 'Tallow Creek Green', 'Hollin Pink Velvet']) {
        await page.getByRole('checkbox', { name: new RegExp(`^${other}`) }).check();
      }
      await page.waitForURL(
        /varieties=velvet-lantern%2Cmossbank-long%2Ctallow-creek-green%2Chollin-pink-velvet|varieties=velvet-lantern,mossbank-long,tallow-creek-green,hollin-pink-velvet/,
      );
      const means = page.getByRole('region', { name: 'Means by trial and site' });
      await means.getByRole('rowheader', { name: 'Hollin Pink Velvet' }).waitFor();
      // Two seasons at three gardens: six environments, one column each after the variety.
      expect(await means.getByRole('columnheader').count()).toBe(7);
      const pairs = page.getByRole('region', { name: 'Pairs' });
      await pairs
        .getByText('Velvet Lantern and Mossbank Long')
        .locator('..')
        .getByText(/Shared 2 trials \(6 environments\)/)
        .waitFor();
      await pairs
        .getByText('Tallow Creek Green and Hollin Pink Velvet')
        .locator('..')
        .getByText('Never grown in the same trial')
        .waitFor();

      // Stability for okra across the register, with what a slope means in words.
      const stability = page.getByRole('region', { name: 'Stability of each variety' });
      await stability.getByRole('rowheader', { name: 'Copperbell Dwarf' }).waitFor();
      await page.getByText(/above\s+1, it gains more than the average variety/).waitFor();
      const left = stability.getByRole('row').filter({ hasText: 'Tallow Creek Green' });
      await left.getByText(/Left out: not grown in every environment/).waitFor();
      await noSidewaysScroll();
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `variety-compare-${name.replace(' ', '-')}`);
      expect(errors).toEqual([]);
      await context.close();
    },
    240_000,
  );
});

/**
 * A lower-is-better trait on the public sheet: the lead adds plant height (lower is better) and
 * pod count (no preferred direction) to the sheet, previews it (the preview scrolls into view
 * and takes focus) and publishes; a signed-out reader sees plant height ranked smallest mean
 * first with "lower is better" beside it, and pod count with no rank at all. At 360 px and on
 * desktop, with the axe check. The order is checked against the means the page itself prints:
 * for a lower-is-better trait the best entry is the one with the smallest mean (the definition
 * of the direction).
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  watchErrors,
} from '../support/browser';

const SLUG = 'larkhaven-okra-2026';
const TITLE = 'Larkhaven heirloom okra, three gardens';
let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  // The lead has said pod count has no preferred direction (a count of small pods is no better
  // or worse than one of large pods).
  await live.db
    .updateTable('traits')
    .set({ direction: 'none' })
    .where('key', '=', 'pod_count')
    .where('trial_id', '=', (eb) => eb.selectFrom('trials').select('id').where('slug', '=', SLUG))
    .execute();
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

const viewports = [
  { width: 360, height: 780 },
  { width: 1280, height: 900 },
];

/** The rows of one trait's table of entry means: rank (if shown), variety and mean. */
async function meansTable(page: Page, label: string) {
  const table = page.getByRole('region', { name: `${label}: entry means` }).getByRole('table');
  const headers = await table.locator('thead th').allTextContents();
  const rows = await table
    .locator('tbody tr')
    .evaluateAll((trs) =>
      trs.map((tr) => [...tr.children].map((c) => (c.textContent ?? '').trim())),
    );
  return { headers, rows };
}

/** "362.4 cm ± 4.1" → 362.4 */
const leadingNumber = (text: string) => Number(/-?[\d.]+/.exec(text.replace(/,/g, ''))![0]);

describe('a lower-is-better trait on the published sheet', () => {
  it('the lead previews and publishes a sheet with plant height and pod count', async () => {
    const context = await contextAs(browser, live, lead, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${SLUG}/results`);
    await page.getByRole('checkbox', { name: 'Marketable pod count' }).check();
    await expect(page.getByRole('checkbox', { name: 'Plant height' }).isChecked()).resolves.toBe(
      true,
    );
    await page.getByRole('button', { name: 'Save the draft' }).click();
    await page.getByRole('status').filter({ hasText: 'Draft saved.' }).waitFor();

    // Asked for, the preview comes into view and takes the focus (a screen reader reads it next).
    await page.getByRole('button', { name: 'Preview', exact: true }).click();
    const preview = page.getByRole('region', { name: 'Preview' });
    await preview.getByRole('heading', { name: 'Plant height' }).waitFor();
    await expect
      .poll(() => page.evaluate(() => document.activeElement?.getAttribute('aria-label')))
      .toBe('Preview');
    await expect
      .poll(() =>
        preview.evaluate((el) => {
          const box = el.getBoundingClientRect();
          return box.top >= 0 && box.top < window.innerHeight;
        }),
      )
      .toBe(true);
    await expectNoSeriousA11yViolations(page);

    await page.getByRole('button', { name: 'Publish version 1' }).click();
    await page.getByRole('status').filter({ hasText: 'Published version 1' }).waitFor();
    expect(errors).toEqual([]);
    await context.close();
  });

  it('a reader sees plant height ranked smallest first and pod count without ranks', async () => {
    for (const viewport of viewports) {
      const context = await contextAs(browser, live, null, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/r/${SLUG}`);
      await page.getByRole('heading', { level: 1, name: TITLE }).waitFor();

      const height = page.getByRole('region', { name: 'Plant height' });
      await expect(height.locator('p', { hasText: /^lower is better · / }).count()).resolves.toBe(
        1,
      );
      const heights = await meansTable(page, 'Plant height');
      expect(heights.headers[0]).toBe('Rank');
      expect(heights.rows.map((r) => r[0])).toEqual(['1', '2', '3', '4', '5', '6']);
      const heightMeans = heights.rows.map((r) => leadingNumber(r[2]!));
      expect(heightMeans).toEqual([...heightMeans].sort((a, b) => a - b));
      // The caption says which way the ranks run.
      await expect(height.locator('caption').textContent()).resolves.toContain(
        'ranked best first (lower is better)',
      );

      // Higher is better for marketable yield: the largest mean is rank 1.
      const yields = await meansTable(page, 'Marketable yield');
      const yieldMeans = yields.rows.map((r) => leadingNumber(r[2]!));
      expect(yields.rows[0]![0]).toBe('1');
      expect(yieldMeans).toEqual([...yieldMeans].sort((a, b) => b - a));

      // No preferred direction: no rank column, and the sheet says so.
      const counts = page.getByRole('region', { name: 'Marketable pod count' });
      await expect(counts.getByText('no preferred direction (not ranked)').count()).resolves.toBe(
        1,
      );
      const countTable = await meansTable(page, 'Marketable pod count');
      expect(countTable.headers).not.toContain('Rank');
      expect(countTable.rows).toHaveLength(6);

      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `lower-is-better-sheet-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });
});

import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
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

describe('the built app in a real browser', () => {
  it('shows the demo trial to its lead, on desktop and at 360 px', async () => {
    for (const viewport of [
      { width: 1280, height: 900 },
      { width: 360, height: 780 },
    ]) {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto('/');
      await page.getByRole('link', { name: /Larkhaven heirloom okra, three gardens/ }).click();
      await page
        .getByRole('heading', { level: 1, name: 'Larkhaven heirloom okra, three gardens' })
        .waitFor();
      // 6 entries × 3 blocks × 3 sites, from the demo season's design.
      await expect(page.getByText('54', { exact: true }).count()).resolves.toBeGreaterThan(0);
      await expect(page.getByRole('cell', { name: 'Mossbank Long' }).count()).resolves.toBe(1);
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `demo-trial-${viewport.width}`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('serves client routes from the app shell and shows a 404 page for unknown ones', async () => {
    const context = await contextAs(browser, live, null);
    const page = await context.newPage();
    await page.goto('/no/such/page');
    await page.getByRole('heading', { name: 'Nothing grows here' }).waitFor();
    await page.getByRole('link', { name: 'Sign in' }).first().waitFor();
    await expectNoSeriousA11yViolations(page);
    await context.close();
  });
});

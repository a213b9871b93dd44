/**
 * Two screens on a 360 px phone: "What was planted" fits the width (each plot a card, nothing to
 * scroll sideways), and the field log's grid of plots, which is wider than a phone, says so in
 * words and with a shaded edge, is named and scrolls from the keyboard. On desktop the grid fits
 * and says nothing. Axe check on each page.
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
let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;
// Tobiah grows at one site only, so the field log opens on it.
const grower = demoAccounts.find((a) => a.key === 'grower')!;
const phone = { width: 360, height: 780 };
const HINT = 'More plots to the side: swipe or scroll sideways';

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

const pageWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

describe('at 360 px', () => {
  it('"What was planted" fits the phone, each plot with its labelled counts', async () => {
    const context = await contextAs(browser, live, lead, phone);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${SLUG}/planting`);
    const plotsRegion = page.getByRole('region', { name: 'What was planted per plot' });
    await plotsRegion.waitFor();
    expect(await pageWidth(page)).toBeLessThanOrEqual(phone.width);
    const { scrollWidth, clientWidth } = await plotsRegion.evaluate((el) => ({
      scrollWidth: el.scrollWidth,
      clientWidth: el.clientWidth,
    }));
    expect(scrollWidth).toBeLessThanOrEqual(clientWidth);
    // The counts keep their names; a card's fields are inside the phone's width.
    const survivors = page.getByLabel('Survivors, plot 101');
    await survivors.fill('9');
    const box = (await survivors.boundingBox())!;
    expect(box.x + box.width).toBeLessThanOrEqual(phone.width);
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'what-was-planted-360');
    expect(errors).toEqual([]);
    await context.close();
  });

  it('the field log’s plot grid says it scrolls sideways and scrolls from the keyboard', async () => {
    const context = await contextAs(browser, live, grower, phone);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${SLUG}/log`);
    const grid = page.getByRole('region', { name: 'Plots by block' });
    await grid.waitFor();
    await page.getByText(HINT).waitFor();
    await expect(grid.getAttribute('aria-describedby')).resolves.toBe(
      await page.getByText(HINT).getAttribute('id'),
    );
    const shade = page.locator('[data-scroll-shade]');
    await expect(shade.count()).resolves.toBe(1);
    expect(await pageWidth(page)).toBeLessThanOrEqual(phone.width);
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'field-log-plot-grid-360');

    // Focused, the grid scrolls with the right arrow key; at its end the shade goes.
    await grid.focus();
    const scrolled = () => grid.evaluate((el) => el.scrollLeft);
    expect(await scrolled()).toBe(0);
    for (let i = 0; i < 30; i++) await page.keyboard.press('ArrowRight');
    await expect.poll(scrolled).toBeGreaterThan(0);
    await expect.poll(() => shade.count()).toBe(0);
    expect(errors).toEqual([]);
    await context.close();
  });
});

describe('on desktop', () => {
  it('the plot grid fits and shows no hint', async () => {
    const context = await contextAs(browser, live, grower, { width: 1280, height: 900 });
    const page = await context.newPage();
    await page.goto(`/t/${SLUG}/log`);
    const grid = page.getByRole('region', { name: 'Plots by block' });
    await grid.waitFor();
    await page.getByRole('button', { name: /Plot 101/ }).waitFor();
    await expect(page.getByText(HINT).count()).resolves.toBe(0);
    await expect(grid.getAttribute('aria-describedby')).resolves.toBeNull();
    await expectNoSeriousA11yViolations(page);
    await context.close();
  });
});

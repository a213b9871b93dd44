/**
 * No signal at all: a grower who opened the field log once can reload it in the field with the
 * phone offline — the app shell comes from the service worker, the trial from the on-device
 * copy — log a harvest, and it is stored when the signal returns.
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import {
  closeBrowserSuite,
  contextAs,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  expectNoSeriousA11yViolations,
} from '../support/browser';

const SLUG = 'larkhaven-okra-2026';
let live: LiveApp;
let browser: Browser;
const grower = demoAccounts.find((a) => a.key === 'grower2')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

const harvestCount = async () =>
  Number(
    (
      await live.db
        .selectFrom('harvests')
        .select((eb) => eb.fn.countAll().as('n'))
        .where('deleted_at', 'is', null)
        .executeTakeFirstOrThrow()
    ).n,
  );

describe('the field log with no signal', () => {
  it('reloads offline from the device and stores the queued harvest when back online', async () => {
    const context = await contextAs(browser, live, grower, { width: 360, height: 780 }, 'allow');
    const page = await context.newPage();
    await page.goto(`/t/${SLUG}/log`);
    await page.getByRole('heading', { level: 1, name: 'Field log' }).waitFor();
    // The service worker takes control, and the trial is written to the device.
    await expect
      .poll(() => page.evaluate(() => Boolean(navigator.serviceWorker.controller)), {
        timeout: 30_000,
      })
      .toBe(true);
    await expect
      .poll(
        () =>
          page.evaluate(() =>
            (localStorage.getItem('rowtally-cache') ?? '').includes('Quarry Lane Allotment'),
          ),
        { timeout: 15_000 },
      )
      .toBe(true);

    const before = await harvestCount();
    await context.setOffline(true);
    await page.reload();
    await page.getByRole('heading', { level: 1, name: 'Field log' }).waitFor();
    await page.getByRole('button', { name: 'Quarry Lane Allotment' }).click();
    await page.getByRole('heading', { name: /^Plot 101 · / }).waitFor();
    await page.getByLabel('Marketable count').fill('17');
    await page.getByLabel('Marketable mass (g)').fill('240');
    await page.getByRole('button', { name: 'Save and next plot' }).click();
    await page.getByTestId('outbox-summary').getByText('1 waiting').waitFor();
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'field-log-reloaded-offline-360');
    expect(await harvestCount()).toBe(before);

    await context.setOffline(false);
    await page.getByTestId('outbox-summary').getByText('1 saved').waitFor({ timeout: 60_000 });
    expect(await harvestCount()).toBe(before + 1);
    const row = await live.db
      .selectFrom('harvests')
      .select(['fruit_count', 'mass_g'])
      .orderBy('created_at', 'desc')
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ fruit_count: 17, mass_g: 240 });
    await context.close();
  });
});

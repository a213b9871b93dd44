/** A lead who reads US units types one day's station reading; it is stored in °C and mm. */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import {
  closeBrowserSuite,
  contextAs,
  openBrowserSuite,
  expectNoSeriousA11yViolations,
  type LiveApp,
  watchErrors,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  await live.db
    .updateTable('users')
    .set({ unit_system: 'us' })
    .where('email', '=', lead.email)
    .execute();
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

describe('typing in one day of weather', () => {
  it('converts °F and inches to the stored °C and mm', async () => {
    const context = await contextAs(browser, live, lead, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto('/t/fennick-bush-beans-2026/analysis');
    await page.getByRole('heading', { name: 'Type in one day' }).waitFor({ timeout: 30_000 });
    await page.getByLabel('Date').fill('2026-10-02');
    await page.getByLabel('Low (°F)').fill('50');
    await page.getByLabel('High (°F)').fill('86');
    await page.getByLabel('Rain (in)').fill('0.5');
    await page.getByRole('button', { name: 'Save the day' }).click();
    await page.getByText('Saved 2026-10-02.').waitFor();
    await expectNoSeriousA11yViolations(page);
    const row = await live.db
      .selectFrom('daily_weather')
      .select(['tmin_c', 'tmax_c', 'rain_mm'])
      .where('observed_on', '=', '2026-10-02')
      .executeTakeFirstOrThrow();
    // 50 °F = 10 °C, 86 °F = 30 °C (°C = (°F − 32) × 5/9); 0.5 in = 12.7 mm (1 in = 25.4 mm, NIST).
    expect(row.tmin_c).toBeCloseTo(10, 9);
    expect(row.tmax_c).toBeCloseTo(30, 9);
    expect(row.rain_mm).toBeCloseTo(12.7, 9);
    expect(errors).toEqual([]);
    await context.close();
  });
});

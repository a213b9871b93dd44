import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { slugFromTitle } from '../../server/design/design-service';
import { createUser, type TestUser } from '../support/test-app';
import {
  closeBrowserSuite,
  contextAs,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  screenshotDir,
  watchErrors,
  expectNoSeriousA11yViolations,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
let lead: TestUser;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: false }));
  lead = await createUser(live.db, { name: 'Perrin Ashgrove', email: 'perrin@ashgrove.example' });
});
afterAll(() => closeBrowserSuite(live, browser));

const entries = [
  ['AT', 'Ashgrove Tall', '30'],
  ['BD', 'Burrow Dwarf', '90'],
  ['CG', 'Cindervale Green', '30'],
  ['DR', 'Dappleford Red', '45'],
  ['EL', 'Elmstead Long', '30'],
] as const;

/** Page count of a PDF, read by poppler's pdfinfo. */
function pdfPages(file: string): number {
  const info = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
  return Number(/^Pages:\s+(\d+)/m.exec(info)![1]);
}

/** Walks the design pages; returns the new trial's address (the title's words and a random tail). */
async function journey(page: Page, title: string, tag: string): Promise<string> {
  await page.goto('/');
  await page.getByRole('link', { name: 'New trial' }).click();
  await page.getByRole('heading', { level: 1, name: 'New trial' }).waitFor();
  await page.getByLabel('Title').fill(title);
  await page.getByLabel('Crop').fill('Okra');
  await page.getByLabel('Season').fill('2027');
  await page.getByLabel('Design').selectOption('rcbd');
  await page.getByLabel('Sowing date').fill('2027-05-10');
  await page.getByRole('button', { name: 'Create trial' }).click();

  await page.getByRole('heading', { level: 1, name: 'Entries' }).waitFor();
  const slug = new URL(page.url()).pathname.split('/')[2]!;
  expect(slug).toMatch(new RegExp(`^${slugFromTitle(title)}-[a-z2-9]{6}$`));
  for (const [code, name, spacingCm] of entries) {
    const form = page.getByRole('form', { name: 'Add an entry' });
    await form.getByLabel('Code').fill(code);
    await form.getByLabel('Variety name').fill(name);
    await form.getByLabel('In-row spacing').fill(spacingCm);
    await form.getByRole('button', { name: 'Add entry' }).click();
    await page.getByRole('listitem').filter({ hasText: name }).waitFor();
  }
  await page.getByText('5 entries').waitFor();

  await page
    .getByRole('navigation', { name: 'Trial design' })
    .getByRole('link', { name: 'Sites' })
    .click();
  const site = page.getByRole('form', { name: 'Add a site' });
  await site.getByLabel('Site name').fill('Ashgrove back garden');
  await site.getByLabel('Town or region').fill('Ashgrove, north end');
  await site.getByLabel('Soil texture (USDA class)').selectOption('silt loam');
  await site.getByLabel('Irrigation').selectOption('drip');
  // the backflow caution shows once an irrigation method is chosen
  await page
    .getByRole('complementary', { name: /Irrigation connected to drinking water/ })
    .waitFor();
  await site.getByRole('button', { name: 'Add site' }).click();
  await page.getByText('1 site', { exact: true }).waitFor();

  await page
    .getByRole('navigation', { name: 'Trial design' })
    .getByRole('link', { name: 'Traits' })
    .click();
  await page.getByRole('button', { name: 'Add Marketable yield' }).click();
  await page.getByRole('button', { name: 'Add Marketable yield' }).waitFor({ state: 'detached' });
  await page.getByRole('button', { name: 'Add Spines or skin irritation' }).click();
  await page.getByRole('complementary', { name: /Spiny or irritating plants/ }).waitFor();

  await page
    .getByRole('navigation', { name: 'Trial design' })
    .getByRole('link', { name: 'Layout' })
    .click();
  const layout = page.getByRole('form', { name: 'Layout' });
  await layout.getByLabel('Blocks (replicates)').fill('3');
  await layout.getByLabel('Row length').fill('3');
  await layout.getByLabel('Between-row spacing').fill('90');
  await layout.getByLabel('Seed').fill('4242');
  await layout.getByRole('button', { name: 'Generate layout' }).click();
  await page.getByRole('heading', { name: 'Plot plan · seed 4242' }).waitFor();
  const planRows = page.locator('table tbody tr');
  expect(await planRows.count()).toBe(15);
  // 3 m row at 30 cm → 10 plants; the dwarf at 90 cm → 3 (floor(row / spacing))
  const plannedOf = async (code: string) =>
    (await page.locator('tbody tr', { hasText: code }).allInnerTexts()).map((t) =>
      t.trim().split(/\s+/).pop(),
    );
  expect(new Set(await plannedOf('AT'))).toEqual(new Set(['10']));
  expect(new Set(await plannedOf('BD'))).toEqual(new Set(['3']));
  // each block holds each entry once
  for (const block of ['1', '2', '3']) {
    const codes = await page
      .locator('tbody tr')
      .filter({ has: page.locator(`td:nth-child(2):text-is("${block}")`) })
      .locator('td:nth-child(3) span')
      .allInnerTexts();
    expect(codes.sort()).toEqual(['AT', 'BD', 'CG', 'DR', 'EL']);
  }
  await expectNoSeriousA11yViolations(page);
  await screenshot(page, `design-layout-${tag}`);

  await page.getByRole('link', { name: 'Planting map' }).first().click();
  const map = page.getByTestId('planting-map');
  await map.waitFor();
  expect(await map.locator('rect[data-plot]').count()).toBe(15);
  expect(await page.getByText('Legend').count()).toBe(1);
  const box = (await map.boundingBox())!;
  const viewport = page.viewportSize()!;
  expect(box.x + box.width).toBeLessThanOrEqual(viewport.width);
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
    viewport.width,
  );
  await expectNoSeriousA11yViolations(page);
  await screenshot(page, `design-map-${tag}`);

  // the print view: one sheet, with the drawing inside the printable box
  await page.getByLabel('Paper').selectOption('a4');
  await page.emulateMedia({ media: 'print' });
  const printWidthMm = Number(await map.getAttribute('data-print-width-mm'));
  const printedPx = (await map.boundingBox())!.width;
  expect(printedPx).toBeCloseTo((printWidthMm / 25.4) * 96, 0);
  await expectNoSeriousA11yViolations(page);
  await screenshot(page, `design-map-print-${tag}`);
  await page.emulateMedia({ media: 'screen' });
  fs.mkdirSync(screenshotDir, { recursive: true });
  for (const paper of ['a4', 'letter'] as const) {
    await page.getByLabel('Paper').selectOption(paper);
    await page.emulateMedia({ media: 'print' });
    const file = path.join(screenshotDir, `design-map-${paper}-${tag}.pdf`);
    await page.pdf({ path: file, preferCSSPageSize: true, printBackground: true });
    expect(pdfPages(file)).toBe(1);
    // the sheet is the size asked for (pdfinfo reports points: A4 595 × 842, Letter 612 × 792)
    const size = /Page size:\s+([\d.]+) x ([\d.]+) pts/.exec(
      execFileSync('pdfinfo', [file], { encoding: 'utf8' }),
    )!;
    const sides = [Number(size[1]), Number(size[2])].sort((a, b) => a - b);
    const expected = paper === 'a4' ? [595.28, 841.89] : [612, 792];
    // Chromium rounds the sheet to whole CSS pixels: within a point
    sides.forEach((side, i) => expect(Math.abs(side - expected[i]!)).toBeLessThan(1));
    await page.emulateMedia({ media: 'screen' });
  }

  await page
    .getByRole('navigation', { name: 'Trial design' })
    .getByRole('link', { name: 'Field sheet' })
    .click();
  await page.getByRole('button', { name: 'Print field sheet' }).waitFor();
  expect(await page.locator('table.field-sheet tbody tr').count()).toBe(15);
  await page.getByRole('complementary', { name: /Field work in heat/ }).waitFor();
  await page.getByRole('complementary', { name: /Spiny or irritating plants/ }).waitFor();
  await page.emulateMedia({ media: 'print' });
  await expectNoSeriousA11yViolations(page);
  await screenshot(page, `design-field-sheet-print-${tag}`);
  await page.emulateMedia({ media: 'screen' });

  await page
    .getByRole('navigation', { name: 'Trial design' })
    .getByRole('link', { name: 'What was planted' })
    .click();
  await page.getByRole('button', { name: 'Fill plants set from the plan' }).click();
  const first = page.locator('tbody tr').first();
  // On a phone each row is a card whose heading reads "Plot 101".
  const plot = (await first.locator('th').innerText()).trim().replace(/^Plot\s+/, '');
  await page.getByLabel(`Survivors, plot ${plot}`).fill('999');
  await page.getByRole('button', { name: 'Save what was planted' }).click();
  await page.getByText('Survivors cannot outnumber the plants set.', { exact: true }).waitFor();
  await page.getByRole('alert').filter({ hasText: 'nothing was saved' }).waitFor();
  // By keyboard: while the form re-checks each change the row's inputs keep the caret, and Tab
  // goes on to the next count of the same plot.
  const survivors = page.getByLabel(`Survivors, plot ${plot}`);
  await survivors.selectText();
  await page.keyboard.type('1');
  await page.keyboard.press('Tab');
  await expect
    .poll(() => page.evaluate(() => document.activeElement?.getAttribute('aria-label')))
    .toBe(`Gaps, plot ${plot}`);
  await page.keyboard.type('0');
  await expect(survivors.inputValue()).resolves.toBe('1');
  await expect(page.getByLabel(`Gaps, plot ${plot}`).inputValue()).resolves.toBe('0');
  await page.getByRole('button', { name: 'Save what was planted' }).click();
  await page.getByRole('status').filter({ hasText: 'Saved 15 plots.' }).waitFor();
  return slug;
}

describe('a lead designs a trial in a real browser', () => {
  for (const [tag, viewport] of [
    ['desktop', { width: 1280, height: 900 }],
    ['360', { width: 360, height: 780 }],
  ] as const) {
    it(`creates the trial, entries, a site, the layout, the map and the print view (${tag})`, async () => {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      const slug = await journey(page, `Ashgrove okra ${tag}`, tag);
      // the overview links to the design pages for the lead
      await page.goto(`/t/${slug}`);
      await page
        .getByRole('navigation', { name: 'Design the trial' })
        .getByRole('link', { name: 'Layout' })
        .waitFor();
      // 400 answers the journey provoked on purpose show in the console as failed loads
      expect(errors.filter((e) => !/status of 400/.test(e))).toEqual([]);
      await context.close();
    });
  }
});

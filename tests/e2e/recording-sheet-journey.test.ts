/**
 * The recording sheet, paper backup of a round: a lead opens it from the field log, picks a site,
 * a date and kilograms, sees the blank columns with their units, downloads the same columns as
 * CSV, types two plots in, and imports it on the import page; the records arrive in grams and
 * millimetres. At desktop width and at 360 px, with the axe check on both pages.
 */
import fs from 'node:fs';
import { parse } from 'csv-parse/sync';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeCsv } from '../../common/csv';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  watchErrors,
} from '../support/browser';
import { createUser, type TestUser } from '../support/test-app';
import { insertBlocksTrial, type SmallTrial, vigorScoreTrait } from '../support/trial-fixture';

let live: LiveApp;
let browser: Browser;
let lead: TestUser;
let trial: SmallTrial;
let heightId: string;
const slug = 'wrenby-bean-sheet';
const day = (back: number) => new Date(Date.now() - back * 86_400_000).toISOString().slice(0, 10);

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: false }));
  const db = live.db;
  lead = await createUser(db, { name: 'Maren Holloway' });
  trial = await insertBlocksTrial(db, {
    trial: { slug, title: 'Wrenby bean sheet', crop: 'Pole bean' },
    siteName: 'Wrenby Croft',
    entryNames: ['Amberlace', 'Cobble Runner'],
    blocks: 2,
    trait: vigorScoreTrait,
  });
  heightId = (
    await db
      .insertInto('traits')
      .values({
        trial_id: trial.trialId,
        key: 'plant_height',
        label: 'Plant height',
        quantity_kind: 'length',
        basis: 'plant',
        direction: 'none',
        sort_order: 2,
      })
      .returning('id')
      .executeTakeFirstOrThrow()
  ).id;
  await db
    .insertInto('trial_members')
    .values({ trial_id: trial.trialId, user_id: lead.id, role: 'lead' })
    .execute();
});
afterAll(() => closeBrowserSuite(live, browser));

describe('the recording sheet', () => {
  it.each([
    ['desktop', { width: 1280, height: 900 }, 0],
    ['360 px', { width: 360, height: 780 }, 1],
  ] as const)('is printed, typed in and imported (%s)', async (name, viewport, back) => {
    const date = day(back);
    const context = await contextAs(browser, live, lead, viewport);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${slug}/log`);
    await page.getByRole('link', { name: 'Recording sheet' }).click();
    await page.getByRole('heading', { level: 1, name: 'Recording sheet' }).waitFor();
    await page.getByLabel(/^Round date/).fill(date);
    await page.getByLabel('Sample plants per plot').fill('2');
    await page.getByLabel('Mass unit').selectOption('kg');
    const sheet = page.getByTestId('recording-sheet');
    const headings = await sheet.getByRole('columnheader').allInnerTexts();
    expect(headings.map((h) => h.replace(/\s+/g, ' ').trim())).toEqual([
      'Plot plot_number',
      'Entry entry_code',
      'Marketable count marketable_count',
      'Marketable mass (kg) marketable_mass_kg',
      'Cull count cull_count',
      'Cull mass (kg) cull_mass_kg',
      'Vigor (1–5) vigor',
      'Plant height, plant 1 (cm) plant_height_cm_p1',
      'Plant height, plant 2 (cm) plant_height_cm_p2',
      'Note note',
    ]);
    // Field order: block 1 then block 2, plot and entry code on each row.
    expect(await sheet.getByRole('rowheader').allInnerTexts()).toEqual([
      '101',
      '102',
      '201',
      '202',
    ]);
    await page.getByText(`Date: ${date}`).waitFor();
    if (name === '360 px')
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        360,
      );
    await expectNoSeriousA11yViolations(page);
    // On paper only the sheet prints: the choices above it are left off.
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('form', { name: 'What the sheet records' }).isVisible()).toBe(
      false,
    );
    expect(await sheet.isVisible()).toBe(true);
    await page.emulateMedia({ media: 'screen' });
    await screenshot(page, `recording-sheet-${name.replace(' ', '')}`);

    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: 'Download CSV to type in' }).click(),
    ]);
    expect(download.suggestedFilename()).toBe(`${slug}-wrenby-croft-recording-sheet-${date}.csv`);
    const [header, ...rows] = parse(
      fs.readFileSync((await download.path())!, 'utf8'),
    ) as string[][];
    expect(header).toEqual([
      'site',
      'plot_number',
      'entry_code',
      'recorded_on',
      'marketable_count',
      'marketable_mass_kg',
      'cull_count',
      'cull_mass_kg',
      'vigor',
      'plant_height_cm_p1',
      'plant_height_cm_p2',
      'note',
    ]);
    expect(rows.map((r) => r.slice(0, 4))).toEqual(
      ['101', '102', '201', '202'].map((n, i) => [
        'Wrenby Croft',
        n,
        i % 2 === 0 ? 'E1' : 'E2',
        date,
      ]),
    );

    // Typed in from the paper: plot 101 harvested and scored, plot 202 measured, the rest blank.
    rows[0]!.splice(4, 7, '14', '2,35', '1', '0.2', '4', '', '');
    rows[3]!.splice(4, 7, '', '', '', '', '', '88', '91.5');
    rows[3]![11] = 'leaning after wind';
    const typed = writeCsv(header!, rows);

    await page.goto(`/t/${slug}/records/files`);
    await page.getByLabel('Records in the file').selectOption('sheet');
    await page.getByLabel('Or paste the rows').fill(typed);
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByText('5 new · 0 already recorded · 0 problems').waitFor();
    await expectNoSeriousA11yViolations(page);
    await page.getByRole('button', { name: 'Import 5 records' }).click();
    await page.getByText('Imported 5 records.').waitFor();

    const harvests = await live.db
      .selectFrom('harvests')
      .select(['plot_id', 'fruit_count', 'mass_g', 'grade'])
      .where('harvested_on', '=', date)
      .orderBy('mass_g')
      .execute();
    expect(harvests).toEqual([
      { plot_id: trial.plotIds[101], fruit_count: 1, mass_g: 200, grade: 'cull' },
      { plot_id: trial.plotIds[101], fruit_count: 14, mass_g: 2350, grade: 'marketable' },
    ]);
    const observations = await live.db
      .selectFrom('observations')
      .select(['plot_id', 'trait_id', 'plant_number', 'value', 'note'])
      .where('observed_on', '=', date)
      .orderBy('value')
      .execute();
    expect(observations).toEqual([
      {
        plot_id: trial.plotIds[101],
        trait_id: trial.traitId,
        plant_number: null,
        value: 4,
        note: '',
      },
      {
        plot_id: trial.plotIds[202],
        trait_id: heightId,
        plant_number: 1,
        value: 880,
        note: 'leaning after wind',
      },
      {
        plot_id: trial.plotIds[202],
        trait_id: heightId,
        plant_number: 2,
        value: 915,
        note: 'leaning after wind',
      },
    ]);
    expect(errors).toEqual([]);
    await context.close();
  });
});

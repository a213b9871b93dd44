/**
 * Plot labels: a lead prints the stake labels of a site; the QR code on a label, read from the
 * rendered page by jsQR (an independent decoder of ISO/IEC 18004), is the plot's address, and a
 * grower's phone at 360 px opens the field log at that plot from it. The grower's site is then
 * remembered on the next visit.
 */
import jsQR from 'jsqr';
import type { Browser } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { plotAddress } from '../../common/plot-labels';
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
let grower: TestUser;
let trial: SmallTrial;
let eastPlots: Record<number, string>;
const slug = 'sallowmere-bean-labels';
const labelDensity = 3;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: false }));
  const db = live.db;
  lead = await createUser(db, { name: 'Ines Quarrow' });
  grower = await createUser(db, { name: 'Tobin Haskett' });
  trial = await insertBlocksTrial(db, {
    trial: { slug, title: 'Sallowmere bean labels', crop: 'Pole bean' },
    siteName: 'Sallowmere West',
    entryNames: ['Gilded Runner', 'Mossback', 'Pennywhistle'],
    blocks: 2,
    trait: vigorScoreTrait,
  });
  const east = await db
    .insertInto('sites')
    .values({ trial_id: trial.trialId, name: 'Sallowmere East' })
    .returning('id')
    .executeTakeFirstOrThrow();
  const rows = await db
    .insertInto('plots')
    .values(
      trial.entryIds.map((entryId, i) => ({
        trial_id: trial.trialId,
        site_id: east.id,
        entry_id: entryId,
        block: 1,
        position: i + 1,
        plot_number: 501 + i,
      })),
    )
    .returning(['id', 'plot_number'])
    .execute();
  eastPlots = Object.fromEntries(rows.map((r) => [r.plot_number, r.id]));
  await db
    .insertInto('trial_members')
    .values([
      { trial_id: trial.trialId, user_id: lead.id, role: 'lead' },
      { trial_id: trial.trialId, user_id: grower.id, role: 'grower' },
    ])
    .execute();
});
afterAll(() => closeBrowserSuite(live, browser));

/**
 * The QR code of one label, as the page draws it, read back with jsQR. A label's code is 22 mm on
 * paper but only ~85 CSS pixels on screen (1.7 px per module), too coarse for a decoder at one
 * device pixel per CSS pixel: the contexts that read labels draw at a phone's density (3×, ~5 px
 * per module), as a phone's camera would see the printed label at arm's length.
 */
async function readLabel(page: import('playwright-core').Page, plotNumber: number) {
  const png = await page.getByRole('img', { name: `Code for plot ${plotNumber}` }).screenshot();
  const { data, info } = await sharp(png).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  return jsQR(new Uint8ClampedArray(data), info.width, info.height)?.data ?? null;
}

describe('plot labels', () => {
  it.each([
    ['desktop', { width: 1280, height: 900 }],
    ['360 px', { width: 360, height: 780 }],
  ])('prints a site’s labels whose codes hold each plot’s address (%s)', async (name, viewport) => {
    const context = await contextAs(browser, live, lead, viewport, 'block', labelDensity);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${slug}/log/labels`);
    await page.getByRole('heading', { level: 1, name: 'Plot labels' }).waitFor();
    await page.getByLabel('Site').selectOption({ label: 'Sallowmere East' });
    await page.getByText('3 labels on 1 sheet').waitFor();
    await page.getByTestId('plot-label-502').getByText('E2', { exact: true }).waitFor();
    expect(await readLabel(page, 502)).toBe(plotAddress(live.url, slug, eastPlots[502]!));
    await page.getByLabel('Site').selectOption({ label: 'Sallowmere West' });
    await page.getByText('6 labels on 1 sheet').waitFor();
    expect(await readLabel(page, 201)).toBe(plotAddress(live.url, slug, trial.plotIds[201]!));
    await page.getByLabel('Label sheet', { exact: true }).selectOption('letter-30');
    expect(await readLabel(page, 101)).toBe(plotAddress(live.url, slug, trial.plotIds[101]!));
    if (name === '360 px')
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
        360,
      );
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, `plot-labels-${name.replace(' ', '')}`);
    expect(errors).toEqual([]);
    await context.close();
  });

  it('opens the field log at the scanned plot on a phone, and remembers the site', async () => {
    const context = await contextAs(browser, live, grower, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    const lead360 = await contextAs(
      browser,
      live,
      lead,
      { width: 1280, height: 900 },
      'block',
      labelDensity,
    );
    const labels = await lead360.newPage();
    await labels.goto(`/t/${slug}/log/labels`);
    await labels.getByLabel('Site').selectOption({ label: 'Sallowmere East' });
    const address = await readLabel(labels, 503);
    await lead360.close();

    await page.goto(address!.replace(live.url, ''));
    await page.getByRole('heading', { name: /^Plot 503 · Pennywhistle/ }).waitFor();
    await expect(
      page.getByRole('button', { name: 'Sallowmere East' }).getAttribute('aria-pressed'),
    ).resolves.toBe('true');
    await expectNoSeriousA11yViolations(page);
    // Typing a plot number still works beside the scanner.
    await page.getByLabel('Plot number').fill('501');
    await page.getByRole('button', { name: 'Go to plot' }).click();
    await page.getByRole('heading', { name: /^Plot 501 · Gilded Runner/ }).waitFor();

    // The grower picks a site; the next visit starts there without a tap.
    await page.getByRole('button', { name: 'Sallowmere West' }).click();
    await page.getByRole('heading', { name: /^Plot 101 · / }).waitFor();
    await page.goto(`/t/${slug}/log`);
    await page.getByRole('heading', { name: /^Plot 101 · / }).waitFor();
    await expect(
      page.getByRole('button', { name: 'Sallowmere West' }).getAttribute('aria-pressed'),
    ).resolves.toBe('true');
    expect(errors).toEqual([]);
    await context.close();
  });
});

/**
 * A whole season's end on the demo trial: the lead compares the entries, writes the results
 * sheet and publishes it; a reader with no account opens it on a phone, sees the ranked table
 * and photos, and prints it.
 */
import sharp from 'sharp';
import request from 'supertest';
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
import { mintSessionCookie } from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  // A cover photo for one entry, uploaded and chosen through the API.
  const cookie = await mintSessionCookie(live, lead);
  const entry = await live.db
    .selectFrom('entries as e')
    .innerJoin('trials as t', 't.id', 'e.trial_id')
    .select('e.id')
    .where('t.slug', '=', SLUG)
    .where('e.code', '=', 'ML')
    .executeTakeFirstOrThrow();
  const image = await sharp({
    create: { width: 900, height: 600, channels: 3, background: '#4a8a57' },
  })
    .jpeg()
    .toBuffer();
  const up = await request(live.app)
    .post(`/api/trials/${SLUG}/photos`)
    .set('Origin', live.url)
    .set('Cookie', cookie)
    .field('caption', 'Mossbank Long, long ridged pods')
    .field('entryId', entry.id)
    .attach('photo', image, { filename: 'ml.jpg', contentType: 'image/jpeg' });
  expect(up.status, up.text).toBe(201);
  const cover = await request(live.app)
    .put(`/api/trials/${SLUG}/photos/${up.body.photos[0].id}/cover`)
    .set('Origin', live.url)
    .set('Cookie', cookie);
  expect(cover.status, cover.text).toBeLessThan(300);
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

describe('season journey', () => {
  it('lead compares, edits and publishes; a reader opens it on a phone and prints', async () => {
    const context = await contextAs(browser, live, lead);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${SLUG}`);
    await page.getByRole('link', { name: 'Compare entries' }).click();
    await page.getByRole('heading', { name: 'Compare entries' }).waitFor();
    // The table reads the analysis API: Mossbank Long's marketable yield cell carries a letter group.
    await page.getByRole('rowheader', { name: 'Mossbank Long' }).waitFor();
    await page.getByText('Cumulative marketable harvest per plot').waitFor();
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'compare-desktop');

    await page.goto(`/t/${SLUG}/results`);
    await page.getByRole('heading', { name: 'Results sheet' }).waitFor();
    await page
      .getByLabel('Summary')
      .fill('Mossbank Long yielded most in all three gardens; Copperbell Dwarf stayed shortest.');
    await page.getByRole('button', { name: 'Save the draft' }).click();
    await page.getByText('Draft saved.').waitFor();
    await page.getByRole('button', { name: 'Publish version 1' }).click();
    await page.getByText('Published version 1:').waitFor();
    expect(errors).toEqual([]);
    await context.close();

    const api = (await request(live.app).get(`/api/results/${SLUG}`)).body as {
      ranking: { variety: string }[];
    };
    const reader = await contextAs(browser, live, null, { width: 360, height: 780 });
    const phone = await reader.newPage();
    const readerErrors = watchErrors(phone);
    await phone.goto(`/r/${SLUG}`);
    // The sheet arrives drawn by the server; its Print works once the client holds it.
    await phone.getByRole('button', { name: 'Print', disabled: false }).waitFor();
    await phone
      .getByRole('heading', { level: 1, name: 'Larkhaven heirloom okra, three gardens' })
      .waitFor();
    const ranking = phone.getByRole('table', { name: /ranked by the weighted index/ });
    const names = await ranking.locator('tbody th[scope=row]').allInnerTexts();
    expect(names).toEqual(api.ranking.map((r) => r.variety));
    const img = phone.getByRole('img', { name: 'Mossbank Long, long ridged pods' });
    await img.scrollIntoViewIfNeeded();
    await expect
      .poll(() => img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth > 0))
      .toBe(true);
    expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
      360,
    );
    // The server put the trial's title into the shell for link previews.
    const shell = await request(live.app).get(`/r/${SLUG}`);
    expect(shell.text).toContain(
      '<meta property="og:title" content="Larkhaven heirloom okra, three gardens — results" />',
    );
    await expectNoSeriousA11yViolations(phone);
    await screenshot(phone, 'public-sheet-360');

    await phone.emulateMedia({ media: 'print' });
    expect(await phone.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    expect(await phone.locator('header.no-print').isVisible()).toBe(false);
    const pdf = await phone.pdf({ format: 'A4' });
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(readerErrors).toEqual([]);
    await reader.close();
  });
});

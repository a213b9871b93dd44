/**
 * A contributor on a phone-sized screen, over a throttled link, uploads three photos with
 * progress shown, tags them, and finds them in the entry gallery and the side-by-side view.
 */
import sharp from 'sharp';
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
import { phonePhoto } from '../api/photos-fixtures';

let live: LiveApp;
let browser: Browser;
const contributor = demoAccounts.find((a) => a.key === 'contributor')!;
const slug = 'larkhaven-okra-2026';

/** A photo of noise (it does not compress), so each one takes a while on a slow link. */
async function noisyPhoto(seedColour: string): Promise<Buffer> {
  const noise = await sharp({
    create: {
      width: 900,
      height: 700,
      channels: 3,
      background: '#808080',
      noise: { type: 'gaussian', mean: 128, sigma: 60 },
    },
  })
    .png()
    .toBuffer();
  const base = await phonePhoto({
    width: 900,
    height: 700,
    dateTimeOriginal: '2026:07:15 09:12:00',
    colour: seedColour,
  });
  return sharp(base)
    .composite([{ input: noise, blend: 'overlay' }])
    .jpeg({ quality: 95 })
    .withExif({ IFD2: { DateTimeOriginal: '2026:07:15 09:12:00' } })
    .toBuffer();
}

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
});
afterAll(() => closeBrowserSuite(live, browser));

describe('photos in a real browser', () => {
  it('uploads three photos at 360 px over a slow link and shows them in the galleries', async () => {
    const viewport = { width: 360, height: 780 };
    const context = await contextAs(browser, live, contributor, viewport);
    const page = await context.newPage();
    const errors = watchErrors(page);
    const entry = await live.db
      .selectFrom('entries as e')
      .innerJoin('trials as t', 't.id', 'e.trial_id')
      .select(['e.id', 'e.code', 'e.name'])
      .where('t.slug', '=', slug)
      .orderBy('e.code')
      .execute();
    const [first, second] = entry;

    await page.goto(`/t/${slug}`);
    await page.getByRole('link', { name: 'Photos', exact: true }).click();
    await page.getByRole('heading', { level: 1, name: 'Photos' }).waitFor();
    await page.getByRole('link', { name: 'Upload photos' }).click();
    await page.getByRole('heading', { level: 1, name: 'Upload photos' }).waitFor();

    // Tag the batch with one entry before choosing the files.
    await page
      .getByRole('region', { name: 'Tags for the next photos you add' })
      .getByLabel('Entry')
      .selectOption(first!.id);
    const files = await Promise.all(
      ['#b0413a', '#3a8f4b', '#c9a227'].map(async (c, i) => ({
        name: `pod-${i + 1}.jpg`,
        mimeType: 'image/jpeg',
        buffer: await noisyPhoto(c),
      })),
    );
    await page.getByLabel('Choose photos').setInputFiles(files);
    const photoItem = (i: number) =>
      page.getByRole('listitem', { name: `Photo ${i + 1}: pod-${i + 1}.jpg` });
    for (let i = 0; i < 3; i++) {
      await photoItem(i)
        .getByLabel(/^Caption/)
        .fill(`Pod ${i + 1} of ${first!.name}, side view`);
    }
    await photoItem(2).getByLabel('Subject').selectOption('fruit');

    // About 60 KB/s up: each photo takes seconds, so progress must show between 0 and 100.
    const cdp = await context.newCDPSession(page);
    await cdp.send('Network.enable');
    await cdp.send('Network.emulateNetworkConditions', {
      offline: false,
      latency: 150,
      downloadThroughput: 400 * 1024,
      uploadThroughput: 60 * 1024,
    });
    await page.getByRole('button', { name: 'Upload 3 photos' }).click();
    const batch = page.locator('#batch-progress');
    await page.waitForFunction(() => {
      const el = document.querySelector<HTMLProgressElement>('#batch-progress');
      return el !== null && el.value > 0 && el.value < 100;
    });
    const midway = Number(await batch.getAttribute('value'));
    expect(midway).toBeGreaterThan(0);
    expect(midway).toBeLessThan(100);
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'photos-upload-progress-360');
    await page.getByText('All photos: 3 of 3 uploaded').waitFor({ timeout: 120_000 });
    expect(await batch.getAttribute('value')).toBe('100');
    await cdp.send('Network.emulateNetworkConditions', {
      offline: false,
      latency: 0,
      downloadThroughput: -1,
      uploadThroughput: -1,
    });

    // The entry gallery: the three photos, dated from their own capture time.
    await page.getByRole('link', { name: 'See them in the gallery' }).click();
    await page.getByRole('heading', { level: 1, name: 'Photos' }).waitFor();
    await page.getByLabel('Entry', { exact: true }).selectOption(first!.id);
    const thumbs = page.getByRole('button', { name: /^Open photo: Pod \d of / });
    await expect.poll(() => thumbs.count()).toBe(3);
    await expect.poll(() => page.getByText(/^2026-07-15 · Pod/).count()).toBe(3);
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(scrollWidth).toBeLessThanOrEqual(viewport.width);

    // The lightbox by keyboard.
    await thumbs.first().focus();
    await page.keyboard.press('Enter');
    const dialog = page.getByRole('dialog');
    await dialog.waitFor();
    await expect.poll(() => dialog.getByText('1 / 3').count()).toBe(1);
    await page.keyboard.press('ArrowRight');
    await expect.poll(() => dialog.getByText('2 / 3').count()).toBe(1);
    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'detached' });

    // Side by side, the week of 15 July 2026 (Monday 13 July).
    await page.goto(`/t/${slug}/photos/compare?week=2026-07-15&entries=${first!.id},${second!.id}`);
    await page.getByRole('heading', { level: 1, name: 'Side by side' }).waitFor();
    await page.getByText('2026-07-13 to 2026-07-19').waitFor();
    const column = page.getByRole('list', { name: `Photos of ${first!.name}` });
    await expect.poll(() => column.getByRole('listitem').count()).toBe(3);
    await page.getByText('No photos this week.').waitFor();
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'photos-side-by-side-360');
    expect(errors).toEqual([]);
    await context.close();
  });
});

/**
 * A published sheet is reached by clicking: a signed-out visitor finds it from the home page
 * through the public index (searched by a variety's name), and a signed-in reader who is not a
 * member goes from the trial's card and from the header's trial switcher straight to it.
 */
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  openBrowserSuite,
  publishAs,
  type LiveApp,
  screenshot,
  watchErrors,
} from '../support/browser';
import { createUser, type TestUser } from '../support/test-app';

const SLUG = 'larkhaven-okra-2026';
const TITLE = 'Larkhaven heirloom okra, three gardens';
let live: LiveApp;
let browser: Browser;
let outsider: TestUser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  await publishAs(live, lead.email, SLUG);
  outsider = await createUser(live.db, { name: 'Oswin Tarrant' });
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

/** The register's address of the okra entry Mossbank Long, read from the tables. */
const mossbankSlug = async () =>
  (
    await live.db
      .selectFrom('entries as e')
      .innerJoin('trials as t', 't.id', 'e.trial_id')
      .innerJoin('varieties as v', 'v.id', 'e.variety_id')
      .select('v.slug')
      .where('t.slug', '=', SLUG)
      .where('e.name', '=', 'Mossbank Long')
      .executeTakeFirstOrThrow()
  ).slug;

const viewports = [
  { width: 1280, height: 900 },
  { width: 360, height: 780 },
];

/** The sheet's print and download controls, as a reader's assistive technology names them. */
const sheetTools = (page: Page) => page.getByRole('group', { name: 'Print and download' });

/**
 * Holds back the sheet's own code (its lazily loaded chunk) until `release()`, so the server's
 * drawing is what the reader sees meanwhile; `held()` says whether the page asked for it.
 */
async function holdSheetCode(page: Page) {
  let release!: () => void;
  const released = new Promise<void>((resolve) => (release = resolve));
  let held = false;
  await page.route('**/assets/sheet-view-*.js', async (route) => {
    held = true;
    await released;
    await route.continue();
  });
  return { release, held: () => held };
}

/**
 * Where the drawn sheet sits, measured from the top of the page (so scrolling does not count),
 * once the page's fonts are in: the ranking table, the sheet's title, the app's header and the
 * Print button; and the addresses of the toolbar's links.
 */
async function sheetPlace(page: Page) {
  await page.evaluate(() => document.fonts.ready.then(() => undefined));
  const top = (selector: string) =>
    page
      .locator(selector)
      .first()
      .evaluate((el) => el.getBoundingClientRect().top + window.scrollY);
  const ranking = page.getByRole('table', { name: /ranked by the weighted index/ });
  const print = page.getByRole('button', { name: 'Print' });
  return {
    ranking: await ranking.evaluate((el) => el.getBoundingClientRect().top + window.scrollY),
    title: await top('main h1'),
    headerBottom: await page
      .locator('#root header')
      .first()
      .evaluate((el) => el.getBoundingClientRect().bottom + window.scrollY),
    print: (await print.count()) ? await print.boundingBox() : null,
    links: await sheetTools(page)
      .getByRole('link')
      .evaluateAll((links) => links.map((a) => a.getAttribute('href'))),
  };
}

async function expectFits(page: Page, width: number) {
  const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
  expect(scrollWidth).toBeLessThanOrEqual(width);
}

describe('reaching a published sheet', () => {
  it('a signed-out visitor goes from the home page to the index, searches and opens it', async () => {
    for (const viewport of viewports) {
      const context = await contextAs(browser, live, null, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto('/');
      await page.getByRole('heading', { level: 1, name: 'Trials' }).waitFor();
      await expect(page.title()).resolves.toBe('Trials · Rowtally');
      // Analysing one's own spreadsheet is offered only after signing in.
      await expect(page.getByRole('link', { name: 'Analyze a spreadsheet' }).count()).resolves.toBe(
        0,
      );
      await page.getByRole('main').getByRole('link', { name: 'Published results sheets' }).click();
      await page.getByRole('heading', { level: 1, name: 'Published results sheets' }).waitFor();
      await page.getByRole('status').filter({ hasText: '1 sheet · page 1 of 1' }).waitFor();
      await expect(page.title()).resolves.toBe('Published results sheets · Rowtally');
      await expectNoSeriousA11yViolations(page);

      // A variety of another crop finds nothing; one of the okra's varieties finds the sheet.
      await page.getByLabel('Crop or variety').fill('bush bean');
      await page.getByRole('button', { name: 'Search' }).click();
      await page.getByText('No published sheet matches “bush bean”.').waitFor();
      await page.getByLabel('Crop or variety').fill('mossbank');
      await page.getByRole('button', { name: 'Search' }).click();
      await page.getByText('1 sheet matching “mossbank” · page 1 of 1').waitFor();
      expect(new URL(page.url()).search).toBe('?q=mossbank');
      await expectFits(page, viewport.width);
      await screenshot(page, `published-index-${viewport.width}`);

      await page.getByRole('link', { name: new RegExp(TITLE) }).click();
      await page.waitForURL(`**/r/${SLUG}`);
      await page.getByRole('heading', { level: 1, name: TITLE }).waitFor();
      await page.getByRole('heading', { name: 'Ranking' }).waitFor();
      await expect(page.title()).resolves.toBe(`${TITLE} · Rowtally`);
      await expectNoSeriousA11yViolations(page);
      // A reader who is not signed in is not sent the whole app to keep for offline use.
      await expect(
        page.evaluate(async () => (await navigator.serviceWorker.getRegistrations()).length),
      ).resolves.toBe(0);

      // From the ranking to a variety's page, still signed out: the figures this sheet published.
      await page
        .getByRole('table', { name: /Entries ranked/ })
        .getByRole('link', { name: 'Mossbank Long' })
        .click();
      await page.waitForURL(`**/varieties/${await mossbankSlug()}`);
      await page.getByRole('heading', { level: 1, name: 'Mossbank Long' }).waitFor();
      await page
        .getByRole('region', { name: 'Figures season by season' })
        .getByRole('link', { name: TITLE })
        .first()
        .waitFor();
      await page.getByText('published version 1').first().waitFor();
      await expectFits(page, viewport.width);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('a reader who is not a member goes from the card and the switcher to the public sheet', async () => {
    for (const viewport of viewports) {
      const context = await contextAs(browser, live, outsider, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto('/');
      await page.getByRole('link', { name: new RegExp(TITLE) }).click();
      await page.waitForURL(`**/r/${SLUG}`);
      await page.getByRole('heading', { level: 1, name: TITLE }).waitFor();
      await expect(page.getByText('Sign in to do this').count()).resolves.toBe(0);

      await page.goto('/r');
      await page.getByRole('heading', { level: 1, name: 'Published results sheets' }).waitFor();
      await page.getByRole('combobox').selectOption({ label: TITLE });
      await page.waitForURL(`**/r/${SLUG}`);
      await page.getByRole('heading', { level: 1, name: TITLE }).waitFor();
      await expectFits(page, viewport.width);
      await expectNoSeriousA11yViolations(page);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('the lead, a member, still goes from the card to the trial’s own page', async () => {
    const context = await contextAs(browser, live, lead);
    const page = await context.newPage();
    await page.goto('/');
    await page.getByRole('link', { name: new RegExp(TITLE) }).click();
    await page.waitForURL(`**/t/${SLUG}`);
    await page.getByRole('heading', { level: 1, name: TITLE }).waitFor();
    await expect(page.title()).resolves.toBe(`${TITLE} · Rowtally`);
    await context.close();
  });
});

describe('the sheet drawn on the server', () => {
  it('arrives as HTML with its numbers embedded, readable with no script at all', async () => {
    const answer = await fetch(`${live.url}/r/${SLUG}`);
    expect(answer.status).toBe(200);
    const html = await answer.text();
    expect(html).toContain('id="sheet-prerender"');
    expect(html).toContain(TITLE);
    const data = /<script type="application\/json" id="sheet-data">([^]*?)<\/script>/.exec(html);
    expect(data).not.toBeNull();
    // No "<" inside the embedded JSON: nothing in a title or note can close the script element.
    expect(data![1]).not.toContain('<');
    const embedded = JSON.parse(data![1]!) as { trial: { slug: string }; version: number };
    expect(embedded.trial.slug).toBe(SLUG);
    expect(embedded.version).toBe(1);
    // Each entry links to its variety's page in the server's drawing too.
    const drawn = html.slice(html.indexOf('id="sheet-prerender"'), html.indexOf('id="sheet-data"'));
    expect(drawn).toContain(`href="/varieties/${await mossbankSlug()}"`);
    // A version's own address is drawn too; one that does not exist gets the plain page.
    await expect(fetch(`${live.url}/r/${SLUG}/v/1`).then((r) => r.text())).resolves.toContain(
      'id="sheet-prerender"',
    );
    await expect(fetch(`${live.url}/r/${SLUG}/v/9`).then((r) => r.text())).resolves.not.toContain(
      'id="sheet-prerender"',
    );

    const context = await browser.newContext({ baseURL: live.url, javaScriptEnabled: false });
    const page = await context.newPage();
    await page.goto(`/r/${SLUG}`);
    await expect(page.getByRole('heading', { level: 1, name: TITLE }).count()).resolves.toBe(1);
    await expect(page.getByRole('table').count()).resolves.toBeGreaterThan(0);
    // Its toolbar: the downloads are plain links; Print needs script, so it shows disabled.
    await expect(sheetTools(page).getByRole('link').count()).resolves.toBe(5);
    await expect(page.getByRole('button', { name: 'Print' }).isDisabled()).resolves.toBe(true);
    // On paper the toolbar is not printed.
    await page.emulateMedia({ media: 'print' });
    await expect(sheetTools(page).isVisible()).resolves.toBe(false);
    await context.close();
  });

  it('the client takes over with the embedded numbers: one sheet, no second fetch', async () => {
    for (const viewport of viewports) {
      const context = await contextAs(browser, live, null, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      const sheetRequests: string[] = [];
      page.on('request', (r) => {
        if (new URL(r.url()).pathname === `/api/results/${SLUG}`) sheetRequests.push(r.url());
      });
      await page.goto(`/r/${SLUG}`);
      // Print works once the client has mounted the sheet (the server's drawing shows it disabled).
      await page.getByRole('button', { name: 'Print', disabled: false }).waitFor();
      await expect(page.locator('#sheet-prerender').count()).resolves.toBe(0);
      await expect(page.getByRole('heading', { level: 1, name: TITLE }).count()).resolves.toBe(1);
      expect(sheetRequests).toEqual([]);
      await expectFits(page, viewport.width);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  it('the server’s drawing stays on screen, toolbar and all, and the client’s sheet takes its place without moving it', async () => {
    const base = `/api/results/${SLUG}/v/1`;
    const downloads = [
      `${base}/sheet.pdf?size=a4`,
      `${base}/sheet.pdf?size=letter`,
      `${base}/means.csv`,
      `${base}/plots.csv`,
      `${base}/results.json`,
    ];
    for (const viewport of viewports) {
      const context = await contextAs(browser, live, null, viewport);
      // Every frame from the first: where the ranking table is, how many level-1 headings, main
      // regions and page banners there are, and whether the app (its header) and the client's
      // sheet (its Print button, working) are on the page.
      await context.addInitScript(() => {
        const frames: Record<string, unknown>[] = [];
        (window as unknown as { sheetFrames: typeof frames }).sheetFrames = frames;
        const sample = () => {
          const caption = [...document.querySelectorAll('caption')].find((c) =>
            c.textContent?.startsWith('Entries ranked'),
          );
          const box = caption?.closest('table')?.getBoundingClientRect();
          frames.push({
            app: document.querySelector('#root header') !== null,
            client: [...document.querySelectorAll('button')].some(
              (b) => b.textContent === 'Print' && !b.disabled,
            ),
            ranking: box ? box.height > 0 && box.top < window.innerHeight && box.bottom > 0 : null,
            rankingDrawn: box ? box.height > 0 : false,
            rankingTop: box ? box.top + window.scrollY : null,
            h1: document.querySelectorAll('h1').length,
            main: document.querySelectorAll('main').length,
            banners: [...document.querySelectorAll('header')].filter(
              (h) => !h.closest('main, section, article, aside, nav'),
            ).length,
          });
          requestAnimationFrame(sample);
        };
        requestAnimationFrame(sample);
      });
      const page = await context.newPage();
      const errors = watchErrors(page);
      // The sheet's code is held back until the app has drawn several frames around the drawing
      // and has settled (the reader's session is known: the header offers to sign in).
      const sheetCode = await holdSheetCode(page);
      await page.goto(`/r/${SLUG}`, { waitUntil: 'commit' });
      await page.locator('main #sheet-prerender').waitFor({ state: 'attached' });
      await page.getByRole('link', { name: 'Sign in' }).waitFor();
      await page.waitForFunction(
        () =>
          (window as unknown as { sheetFrames: { app: boolean }[] }).sheetFrames.filter(
            (f) => f.app,
          ).length >= 5,
      );
      expect(sheetCode.held()).toBe(true);
      const drawn = await sheetPlace(page);
      await expectNoSeriousA11yViolations(page, `drawn sheet at ${viewport.width}px`);
      sheetCode.release();
      // The client's sheet is in once its Print button works and the drawing is gone.
      const print = page.getByRole('button', { name: 'Print', disabled: false });
      await print.waitFor();
      await expect(page.locator('#sheet-prerender').count()).resolves.toBe(0);
      const mounted = await sheetPlace(page);
      await page.waitForFunction(() =>
        (window as unknown as { sheetFrames: { client: boolean }[] }).sheetFrames.some(
          (f) => f.client,
        ),
      );
      const frames = await page.evaluate(
        () =>
          (
            window as unknown as {
              sheetFrames: {
                app: boolean;
                client: boolean;
                ranking: boolean | null;
                rankingDrawn: boolean;
                rankingTop: number | null;
                h1: number;
                main: number;
                banners: number;
              }[];
            }
          ).sheetFrames,
      );
      const waiting = frames.filter((f) => f.app && !f.client);
      expect(waiting.length).toBeGreaterThanOrEqual(5);
      // From the first frame that shows the ranking, it is drawn in every frame; never two of
      // anything. On a desktop screen it is in view while the client's sheet loads; at 360 px it
      // starts below the first screen (under the toolbar, the title and the cautions) in both
      // drawings, so there its place is asked, not its visibility.
      const shown = frames.slice(frames.findIndex((f) => f.ranking !== null));
      if (viewport.width >= 1024) {
        expect(shown.filter((f) => !f.client && f.ranking !== true)).toEqual([]);
      }
      expect(shown.filter((f) => !f.rankingDrawn)).toEqual([]);
      expect(frames.filter((f) => f.h1 > 1 || f.main > 1 || f.banners > 1)).toEqual([]);
      // The hand-over itself: from the last frame of the server's drawing to every frame of the
      // client's, the ranking does not move. Common practice (no source): up to 2 px is taken as
      // no shift, for sub-pixel rounding.
      const handOver = frames.findIndex((f) => f.client);
      const before = frames[handOver - 1]!.rankingTop!;
      expect(before).toBeGreaterThan(0);
      const moved = frames
        .slice(handOver)
        .map((f) => Math.abs(f.rankingTop! - before))
        .filter((d) => d > 2);
      expect(moved).toEqual([]);
      // And once both are settled: the ranking, the sheet's title and the app's header in the
      // same place, the same Print box (disabled until the client's sheet is in) and the same
      // download addresses, which work without any script.
      expect(Math.abs(mounted.ranking - drawn.ranking)).toBeLessThanOrEqual(2);
      expect(Math.abs(mounted.title - drawn.title)).toBeLessThanOrEqual(2);
      expect(mounted.headerBottom).toBe(drawn.headerBottom);
      expect(drawn.print).not.toBeNull();
      expect(mounted.print).toEqual(drawn.print);
      expect(drawn.links).toEqual(downloads);
      expect(mounted.links).toEqual(downloads);
      // Print works after the hand-over (the browser's dialog stubbed: it would block the page).
      await page.evaluate(() => {
        const w = window as unknown as { printed: number };
        w.printed = 0;
        window.print = () => void (w.printed += 1);
      });
      await print.click();
      await expect(
        page.evaluate(() => (window as unknown as { printed: number }).printed),
      ).resolves.toBe(1);
      await expectNoSeriousA11yViolations(page, `sheet at ${viewport.width}px`);
      expect(errors).toEqual([]);
      await context.close();
    }
  });

  // Last in this file: it publishes a second version.
  it('an older version’s page does not move either when the versions list and the follow form come in below', async () => {
    await publishAs(live, lead.email, SLUG, 'Republished unchanged, to have a second version.');
    for (const viewport of viewports) {
      const context = await contextAs(browser, live, null, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      const sheetCode = await holdSheetCode(page);
      await page.goto(`/r/${SLUG}/v/1`, { waitUntil: 'commit' });
      await page.locator('main #sheet-prerender').waitFor({ state: 'attached' });
      await page.getByRole('link', { name: 'Sign in' }).waitFor();
      const drawn = await sheetPlace(page);
      sheetCode.release();
      await page.getByRole('button', { name: 'Print', disabled: false }).waitFor();
      await page.getByRole('navigation', { name: 'Versions' }).getByRole('link').first().waitFor();
      await page
        .getByRole('button', { name: /follow/i })
        .first()
        .waitFor();
      const mounted = await sheetPlace(page);
      expect(Math.abs(mounted.ranking - drawn.ranking)).toBeLessThanOrEqual(2);
      expect(drawn.links[0]).toBe(`/api/results/${SLUG}/v/1/sheet.pdf?size=a4`);
      expect(mounted.links).toEqual(drawn.links);
      expect(errors).toEqual([]);
      await context.close();
    }
  });
});

/**
 * Next season in one step, in the browser: the lead copies the demo okra trial from its Settings
 * page; the new trial opens with the same entries, sites and traits, the same design settings,
 * a layout from a new seed and no records, and links back to the trial it came from. At 360 px
 * and on desktop, with the axe check on each page visited. What is compared is the demo trial
 * itself, read from the database.
 */
import type { Browser } from 'playwright-core';
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
const TITLE = 'Larkhaven heirloom okra, three gardens';
let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
}, 120_000);
afterAll(() => closeBrowserSuite(live, browser));

const trialBySlug = (slug: string) =>
  live.db.selectFrom('trials').selectAll().where('slug', '=', slug).executeTakeFirstOrThrow();
const namesOf = async (table: 'entries' | 'sites' | 'traits', trialId: string) =>
  (
    await live.db
      .selectFrom(table)
      .select(table === 'traits' ? 'key as name' : 'name')
      .where('trial_id', '=', trialId)
      .execute()
  )
    .map((r) => r.name)
    .sort();
const countOf = async (table: 'harvests' | 'observations' | 'field_events', trialId: string) =>
  Number(
    (
      await live.db
        .selectFrom(table)
        .select((eb) => eb.fn.countAll().as('n'))
        .where('trial_id', '=', trialId)
        .executeTakeFirstOrThrow()
    ).n,
  );

describe('copying a trial to next season', () => {
  it.each([
    ['360 px', { width: 360, height: 780 }, '2027'],
    ['desktop', { width: 1280, height: 900 }, '2028'],
  ] as const)(
    'from Settings, with everything but the records (%s)',
    async (name, viewport, season) => {
      const context = await contextAs(browser, live, lead, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/t/${SLUG}/settings`);
      const section = page.getByRole('region', { name: 'Copy this trial to next season' });
      await section.waitFor();
      await expectNoSeriousA11yViolations(page);
      const title = `Larkhaven okra ${season}`;
      await section.getByLabel('New trial title').fill(title);
      await section.getByLabel('Season').fill(season);
      await section.getByRole('button', { name: 'Copy the trial' }).click();

      await page.getByRole('heading', { level: 1, name: title }).waitFor();
      const slug = new URL(page.url()).pathname.split('/')[2]!;
      expect(slug).not.toBe(SLUG);
      // The entries come along (the overview lists them).
      for (const variety of ['Mossbank Long', 'Tallow Creek Green', 'Velvet Lantern'])
        await expect(page.getByRole('cell', { name: variety }).count()).resolves.toBe(1);
      const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
      expect(scrollWidth).toBeLessThanOrEqual(viewport.width);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `copied-trial-${name.replace(' ', '-')}`);

      const [source, made] = await Promise.all([trialBySlug(SLUG), trialBySlug(slug)]);
      expect(made).toMatchObject({
        season,
        crop: source.crop,
        design: source.design,
        replicates: source.replicates,
        row_length_mm: source.row_length_mm,
        row_spacing_mm: source.row_spacing_mm,
        fertilizer_policy: source.fertilizer_policy,
        copied_from_trial_id: source.id,
      });
      expect(made.layout_seed).not.toBeNull();
      expect(made.layout_seed).not.toBe(source.layout_seed);
      for (const table of ['entries', 'sites', 'traits'] as const)
        expect(await namesOf(table, made.id)).toEqual(await namesOf(table, source.id));
      for (const table of ['harvests', 'observations', 'field_events'] as const) {
        expect(await countOf(table, source.id)).toBeGreaterThan(0);
        expect(await countOf(table, made.id)).toBe(0);
      }

      // And it links back to the trial it came from.
      await page.goto(`/t/${slug}`);
      await page.getByRole('link', { name: `${TITLE} (2026)` }).click();
      await page.waitForURL(`**/t/${SLUG}`);
      await page.getByRole('heading', { level: 1, name: TITLE }).waitFor();
      expect(errors).toEqual([]);
      await context.close();
    },
  );
});

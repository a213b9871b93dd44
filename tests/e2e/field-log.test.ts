/**
 * A grower at a 360 px phone viewport logs a harvest round with no signal; when the signal
 * returns every entry is sent, and the first answer for each is lost on the way back, so each
 * entry is sent twice. PostgreSQL then holds exactly one harvest per plot.
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  closeBrowserSuite,
  contextAs,
  openBrowserSuite,
  type LiveApp,
  screenshot,
  watchErrors,
  expectNoSeriousA11yViolations,
} from '../support/browser';
import { createUser, type TestUser } from '../support/test-app';

let live: LiveApp;
let browser: Browser;
let grower: TestUser;
let lead: TestUser;
let trialId: string;
const slug = 'brookfold-okra-round';
const entryNames = [
  'Tallow Finger',
  'Redwick Spire',
  'Ashgrove Pod',
  'Minnow Green',
  'Cobble Star',
  'Harrow Lace',
];

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: false }));
  const db = live.db;
  grower = await createUser(db, { name: 'Wren Alderby' });
  lead = await createUser(db, { name: 'Hollis Marchetti' });
  const trial = await db
    .insertInto('trials')
    .values({
      slug,
      title: 'Brookfold okra round',
      crop: 'Okra',
      season: '2026',
      design: 'rcbd',
      status: 'active',
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  trialId = trial.id;
  const site = await db
    .insertInto('sites')
    .values({ trial_id: trial.id, name: 'Brookfold Allotment' })
    .returning('id')
    .executeTakeFirstOrThrow();
  const entries = await db
    .insertInto('entries')
    .values(
      entryNames.map((name, i) => ({
        trial_id: trial.id,
        name,
        code: `E${i + 1}`,
        entry_type: 'heirloom' as const,
      })),
    )
    .returning('id')
    .execute();
  const plots = [];
  for (const block of [1, 2])
    for (const [i, entry] of entries.entries())
      plots.push({
        trial_id: trial.id,
        site_id: site.id,
        entry_id: entry.id,
        block,
        position: i + 1,
        plot_number: block * 100 + i + 1,
      });
  await db.insertInto('plots').values(plots).execute();
  await db
    .insertInto('trial_members')
    .values([
      { trial_id: trial.id, user_id: grower.id, role: 'grower' },
      { trial_id: trial.id, user_id: lead.id, role: 'lead' },
    ])
    .execute();
  await db
    .insertInto('trial_member_sites')
    .values({ trial_id: trial.id, user_id: grower.id, site_id: site.id })
    .execute();
});
afterAll(() => closeBrowserSuite(live, browser));

describe('the field log on a phone', () => {
  it('keeps a whole offline harvest round and stores one record per plot, though each is sent twice', async () => {
    const context = await contextAs(browser, live, grower, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${slug}/log`);
    await page.getByRole('heading', { level: 1, name: 'Field log' }).waitFor();
    // The grower's only site is chosen for them.
    await page.getByText('Site: Brookfold Allotment').waitFor();
    await page.getByRole('heading', { name: /^Plot 101 · Tallow Finger/ }).waitFor();
    // Okra: gloves and long sleeves, shown with the harvest form.
    await page
      .getByRole('complementary', { name: 'Caution: Spiny or irritating plants' })
      .waitFor();

    await context.setOffline(true);
    await page.getByText(/^Offline/).waitFor();
    const plotNumbers = [101, 102, 103, 104, 105, 106, 201, 202, 203, 204, 205, 206];
    for (const [i, n] of plotNumbers.entries()) {
      await page.getByRole('heading', { name: new RegExp(`^Plot ${n} · `) }).waitFor();
      await page.getByLabel('Marketable count').fill(String(10 + i));
      await page.getByLabel('Marketable mass (g)').fill(String(120 + i * 5.5));
      // The second plot also had culls: both grades go in one save.
      if (i === 1) {
        await page.getByLabel('Cull count').fill('2');
        await page.getByLabel('Cull mass (g)').fill('31.5');
      }
      await page.getByRole('button', { name: 'Save and next plot' }).click();
      await page
        .getByTestId('outbox-summary')
        .getByText(`${i + (i >= 1 ? 2 : 1)} waiting`)
        .waitFor();
      // The long caution was read once; from the next plot on it is one line.
      if (i === 0)
        await page
          .getByText('Spiny or irritating plants: read the caution again', { exact: false })
          .waitFor();
    }
    await page.getByText('That was the last plot at this site.', { exact: false }).waitFor();
    expect(
      Number(
        (
          await live.db
            .selectFrom('harvests')
            .select((eb) => eb.fn.countAll().as('n'))
            .executeTakeFirstOrThrow()
        ).n,
      ),
    ).toBe(0);
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(scrollWidth).toBeLessThanOrEqual(360);
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'field-log-offline-360');

    // Each entry's first answer is lost after the server has stored it: the phone sends again.
    const answered = new Set<string>();
    let deliveries = 0;
    await page.route('**/api/trials/*/harvests', async (route) => {
      const id = (JSON.parse(route.request().postData() ?? '{}') as { id?: string }).id ?? '';
      deliveries += 1;
      if (!answered.has(id)) {
        answered.add(id);
        await route.fetch();
        await route.abort('failed');
        return;
      }
      await route.continue();
    });
    await context.setOffline(false);
    await page.getByTestId('outbox-summary').getByText('13 saved').waitFor({ timeout: 60_000 });
    expect(deliveries).toBeGreaterThanOrEqual(26);

    const rows = await live.db
      .selectFrom('harvests as h')
      .innerJoin('plots as p', 'p.id', 'h.plot_id')
      .select(['p.plot_number', 'h.fruit_count', 'h.mass_g', 'h.grade', 'h.created_by'])
      .where('h.trial_id', '=', trialId)
      .orderBy('p.plot_number')
      .orderBy('h.grade')
      .execute();
    expect(rows).toEqual(
      plotNumbers.flatMap((n, i) => [
        ...(n === 102
          ? [{ plot_number: n, fruit_count: 2, mass_g: 31.5, grade: 'cull', created_by: grower.id }]
          : []),
        {
          plot_number: n,
          fruit_count: 10 + i,
          mass_g: 120 + i * 5.5,
          grade: 'marketable',
          created_by: grower.id,
        },
      ]),
    );
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'field-log-saved-360');
    // The browser reports the connection failures we caused; nothing else may go wrong.
    expect(errors.filter((e) => !/Failed to load resource|net::ERR_/.test(e))).toEqual([]);
    await context.close();
  });

  it('shows the lead the round in the harvest log, and a clear 409 when someone saved first', async () => {
    const context = await contextAs(browser, live, lead, { width: 1280, height: 900 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto(`/t/${slug}/records/harvests`);
    await page.getByText(/^13 harvests · /).waitFor();
    // The heading already names the trial: the page title says it once.
    await expect(page.title()).resolves.toBe('Harvest log · Brookfold okra round · Rowtally');
    await page.getByRole('button', { name: /^Edit harvest of plot 101 / }).click();
    // Meanwhile the grower corrects the same harvest from another phone.
    await live.db
      .updateTable('harvests')
      .set({ mass_g: 999, version: 2 })
      .where('trial_id', '=', trialId)
      .where('fruit_count', '=', 10)
      .execute();
    await page.getByLabel('Fruit count').fill('11');
    await page.getByRole('button', { name: 'Save', exact: true }).click();
    const alert = page.getByRole('alert').filter({ hasText: 'Not saved' });
    await alert.waitFor();
    await expect(alert.textContent()).resolves.toContain('version 1 → 2');
    await page.getByRole('button', { name: 'Keep the stored values' }).click();
    const stored = await live.db
      .selectFrom('harvests')
      .select(['fruit_count', 'mass_g'])
      .where('trial_id', '=', trialId)
      .where('mass_g', '=', 999)
      .execute();
    expect(stored).toEqual([{ fruit_count: 10, mass_g: 999 }]);

    for (const [path, heading] of [
      ['completeness', 'Completeness'],
      ['files', 'Import and export'],
      ['audit', 'Audit log'],
      ['observations', 'Observation log'],
    ] as const) {
      await page.goto(`/t/${slug}/records/${path}`);
      await page.getByRole('heading', { level: 1, name: new RegExp(`^${heading}`) }).waitFor();
    }
    await page.goto(`/t/${slug}/log/events`);
    await page.getByText('Site: Brookfold Allotment').waitFor();
    await page.getByLabel('Run time (min)').fill('45');
    await page.getByLabel('Emitter flow (L/h)').fill('2');
    await page.getByLabel('Emitter spacing (cm)').fill('30');
    await page.getByLabel('Wetted width (cm)').fill('40');
    // 2 L/h ÷ (0.30 m × 0.40 m) × 0.75 h = 12.5 mm (1 L over 1 m² = 1 mm).
    await page.getByText('Depth of water applied over the wetted area: 12.5 mm').waitFor();
    await page
      .getByRole('complementary', { name: 'Caution: Irrigation connected to drinking water' })
      .waitFor();
    await page.getByRole('button', { name: 'Save event' }).click();
    await page.getByRole('cell', { name: '12.5 mm' }).first().waitFor();
    // The browser logs the 409 it was given on purpose; nothing else may go wrong.
    expect(errors.filter((e) => !/status of 409/.test(e))).toEqual([]);
    await context.close();
  });
});

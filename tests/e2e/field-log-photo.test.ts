/**
 * A photo taken at a plot with no signal: kept in the field log's outbox beside the records,
 * then sent when the signal returns, and stored tagged with that plot (at 360 px and desktop).
 */
import type { Browser } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
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
let grower: TestUser;
let trial: SmallTrial;
let jpeg: Buffer;
const slug = 'quillby-squash-photos';

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: false }));
  grower = await createUser(live.db, { name: 'Odile Fenwright' });
  trial = await insertBlocksTrial(live.db, {
    trial: { slug, title: 'Quillby squash photos', crop: 'Summer squash' },
    siteName: 'Quillby Orchard Plot',
    entryNames: ['Butterlamp', 'Greyling Scallop'],
    blocks: 2,
    trait: vigorScoreTrait,
  });
  await live.db
    .insertInto('trial_members')
    .values({ trial_id: trial.trialId, user_id: grower.id, role: 'grower' })
    .execute();
  jpeg = await sharp({
    create: { width: 640, height: 480, channels: 3, background: { r: 96, g: 140, b: 70 } },
  })
    .jpeg()
    .toBuffer();
});
afterAll(() => closeBrowserSuite(live, browser));

describe('a photo from the plot', () => {
  it.each([
    ['360 px', { width: 360, height: 780 }, 102],
    ['desktop', { width: 1280, height: 900 }, 201],
  ] as const)(
    'is queued offline and sent when the signal returns (%s)',
    async (name, viewport, plotNumber) => {
      const context = await contextAs(browser, live, grower, viewport);
      const page = await context.newPage();
      const errors = watchErrors(page);
      await page.goto(`/t/${slug}/log`);
      await page.getByLabel('Plot number').fill(String(plotNumber));
      await page.getByRole('button', { name: 'Go to plot' }).click();
      await page.getByRole('heading', { name: new RegExp(`^Plot ${plotNumber} · `) }).waitFor();

      await context.setOffline(true);
      await page.getByText(/^Offline/).waitFor();
      await page.getByLabel('Photo caption').fill(`Leaf mottling at plot ${plotNumber}`);
      await page
        .getByLabel('Add photo')
        .setInputFiles({ name: 'plot.jpg', mimeType: 'image/jpeg', buffer: jpeg });
      await page.getByTestId('outbox-summary').getByText('1 waiting').waitFor();
      await page
        .getByRole('listitem')
        .getByText(`· photo: Leaf mottling at plot ${plotNumber}`)
        .waitFor();
      const before = await live.db
        .selectFrom('photos')
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .where('plot_id', '=', trial.plotIds[plotNumber]!)
        .executeTakeFirstOrThrow();
      expect(Number(before.n)).toBe(0);
      await expectNoSeriousA11yViolations(page);
      await screenshot(page, `field-log-photo-queued-${name.replace(' ', '')}`);

      await context.setOffline(false);
      await page.getByTestId('outbox-summary').getByText('1 saved').waitFor({ timeout: 60_000 });
      const stored = await live.db
        .selectFrom('photos')
        .select(['plot_id', 'caption', 'width', 'height'])
        .where('trial_id', '=', trial.trialId)
        .where('plot_id', '=', trial.plotIds[plotNumber]!)
        .execute();
      expect(stored).toEqual([
        {
          plot_id: trial.plotIds[plotNumber],
          caption: `Leaf mottling at plot ${plotNumber}`,
          width: 640,
          height: 480,
        },
      ]);
      expect(errors.filter((e) => !/Failed to load resource|net::ERR_/.test(e))).toEqual([]);
      await context.close();
    },
  );
});

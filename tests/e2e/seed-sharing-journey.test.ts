/**
 * Seed sharing in a real browser against the built app: a member on a phone follows the
 * published sheet's link to the open offer and asks for a packet through the form; the
 * coordinator, on a desktop, sees the request beside the variety's lots and marks the packet
 * sent, corrects a lot and deletes a germination test typed wrong; the member's letter and the
 * coordinator's arrive in the development mailbox. Every wait is for a state on
 * the page, never for time.
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemoSeedLots } from '../../db/seed/demo-seed-lots';
import { publishDemoSheet } from '../../db/seed/demo-sheet';
import {
  closeBrowserSuite,
  contextAs,
  expectNoSeriousA11yViolations,
  type LiveApp,
  openBrowserSuite,
  screenshot,
  watchErrors,
} from '../support/browser';

let live: LiveApp;
let browser: Browser;
const coordinator = demoAccounts.find((a) => a.key === 'lead')!;
const member = demoAccounts.find((a) => a.key === 'grower')!;
const sheet = '/r/fennick-bush-beans-2026';

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
  await publishDemoSheet(live.db);
  await seedDemoSeedLots(live.db);
});
afterAll(() => closeBrowserSuite(live, browser));

describe('sharing seed', () => {
  it('draws the offer link into the server’s sheet as well as the browser’s', async () => {
    const offer = await live.db
      .selectFrom('seed_offers')
      .select('id')
      .where('status', '=', 'open')
      .executeTakeFirstOrThrow();
    const html = await (await fetch(`${live.url}${sheet}`)).text();
    const drawn = html.slice(html.indexOf('id="sheet-prerender"'));
    // React's server markup puts a comment between a text and a value placed after it.
    expect(drawn.includes(`href="/offers/${offer.id}"`)).toBe(true);
    expect(/Ask for a packet of (<!-- -->)?Dovecote Purple/.test(drawn)).toBe(true);
  });

  it('goes from a member’s request on a phone to the coordinator’s answer and the mail', async () => {
    // The member, on a phone: from the published sheet to the offer.
    const phone = await contextAs(browser, live, member, { width: 360, height: 780 });
    const page = await phone.newPage();
    const errors = watchErrors(page);
    await page.goto(sheet);
    await page.getByRole('heading', { name: 'Seed on offer' }).waitFor();
    await page.getByRole('link', { name: 'Ask for a packet of Dovecote Purple' }).click();
    await page.getByRole('heading', { name: 'Seed of Dovecote Purple' }).waitFor();
    await page.getByText('12 of 12 packets left').waitFor();
    // The contract's own message, before the server is asked.
    await page.getByRole('button', { name: 'Ask for a packet' }).click();
    await page.getByText('Enter the address to send the packet to.').waitFor();
    await expectNoSeriousA11yViolations(page, 'offer page at 360 px');
    await page.getByLabel('Send the packet to').fill('Flat 2, 9 Kettle Yard, Larkhaven');
    await page
      .getByLabel('Message to the coordinator (optional)')
      .fill('For the north bed next spring.');
    await page.getByRole('button', { name: 'Ask for a packet' }).click();
    await page.getByText('Your request: Waiting').waitFor();
    await page.getByText('11 of 12 packets left').waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
      360,
    );
    await screenshot(page, 'seed-offer-phone');
    expect(errors).toEqual([]);

    // The coordinator, on a desktop: the request beside the variety's lots.
    const desk = await contextAs(browser, live, coordinator);
    const deskPage = await desk.newPage();
    const deskErrors = watchErrors(deskPage);
    await deskPage.goto('/varieties/dovecote-purple/seed');
    await deskPage.getByRole('heading', { name: 'Seed of Dovecote Purple' }).waitFor();
    await deskPage.getByRole('heading', { name: 'Lot DP-26' }).waitFor();
    // 93 of 100 germinated: 93 %, with the Wilson interval of common/germination.ts (checked
    // against Newcombe 1998 and R's prop.test in tests/unit/germination.test.ts) to one decimal.
    await deskPage.getByText('93 %', { exact: true }).waitFor();
    await deskPage.getByText('(86.3–96.6 %)').waitFor();
    await deskPage.getByText('Send to: Flat 2, 9 Kettle Yard, Larkhaven').waitFor();
    await expectNoSeriousA11yViolations(deskPage, 'variety seed page');
    await deskPage.getByRole('button', { name: 'Mark Tobiah Wrenfield’s packet sent' }).click();
    await deskPage.getByText('Tobiah Wrenfield (tobiah@larkhaven-seeds.example) · Sent').waitFor();
    await screenshot(deskPage, 'seed-requests-desktop');

    // The coordinator corrects where the lot is kept; the amount, not touched, stays as stored.
    const lotCard = deskPage.getByRole('region', { name: 'Lot DP-26', exact: true });
    await lotCard.getByRole('button', { name: 'Change lot DP-26' }).click();
    const lotEdit = deskPage.getByRole('form', { name: 'Change lot DP-26' });
    expect(await lotEdit.getByLabel('Storage place').inputValue()).toBe('Seed tin 5, north shed');
    await lotEdit.getByLabel('Storage place').fill('Seed tin 6, cellar');
    await lotEdit.getByRole('button', { name: 'Save the changes' }).click();
    await lotCard.getByText(/stored: Seed tin 6, cellar/).waitFor();
    const stored = await live.db
      .selectFrom('seed_lots')
      .select(['amount', 'storage_place'])
      .where('label', '=', 'DP-26')
      .executeTakeFirstOrThrow();
    expect(stored).toEqual({ amount: 250, storage_place: 'Seed tin 6, cellar' });

    // A germination test typed wrong (9 for 93) is deleted after the coordinator confirms.
    const testForm = lotCard.getByRole('form', { name: 'Add a germination test' });
    await testForm.getByLabel('Test read on').fill('2026-11-02');
    await testForm.getByLabel('Seeds tested').fill('100');
    await testForm.getByLabel('Seeds germinated').fill('9');
    await testForm.getByLabel('Days').fill('8');
    await testForm.getByRole('button', { name: 'Add the test' }).click();
    const slip = lotCard.getByRole('row', { name: /2026-11-02/ });
    await slip.waitFor();
    const remove = lotCard.getByRole('button', { name: 'Delete the test read on 2026-11-02' });
    let asked = '';
    deskPage.once('dialog', (d) => {
      asked = d.message();
      void d.dismiss();
    });
    await remove.click();
    expect(asked).toBe(
      'Delete the germination test of lot DP-26 read on 2026-11-02 (9 of 100 germinated)? This cannot be undone.',
    );
    expect(await slip.count()).toBe(1);
    // By keyboard: once the row is gone the focus is on the next test's Delete, not lost.
    deskPage.once('dialog', (d) => void d.accept());
    await remove.focus();
    await deskPage.keyboard.press('Enter');
    await slip.waitFor({ state: 'detached' });
    await deskPage.waitForFunction(() =>
      document.activeElement?.getAttribute('aria-label')?.startsWith('Delete the test read on '),
    );
    await lotCard.getByText('93 %', { exact: true }).waitFor();

    // The same page on a phone: the tables scroll inside their frames, not the page.
    await deskPage.setViewportSize({ width: 360, height: 780 });
    await lotCard.getByRole('button', { name: 'Change lot DP-26' }).waitFor();
    expect(await deskPage.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
      360,
    );
    await expectNoSeriousA11yViolations(deskPage, 'variety seed page at 360 px');
    await screenshot(deskPage, 'seed-lots-phone');
    await deskPage.setViewportSize({ width: 1280, height: 900 });

    // The lead sees which lot each okra entry was sown from, on the trial's entries.
    await deskPage.goto('/t/larkhaven-okra-2026/entries');
    const lotChoice = deskPage.getByLabel('Seed lot of Velvet Lantern');
    await lotChoice.waitFor();
    expect(await lotChoice.locator('option:checked').textContent()).toBe('VL-25 (2025)');
    expect(deskErrors).toEqual([]);

    // The member's letter, in the development mailbox.
    await page.goto('/dev/mailbox');
    const letter = page.getByRole('article', { name: /Your Dovecote Purple seed is on its way/ });
    await letter.waitFor();
    await letter
      .getByText('Larkhaven Seed Library has sent you a packet of Dovecote Purple seed.')
      .waitFor();
    await letter
      .getByRole('link', { name: /\/offers\// })
      .first()
      .waitFor();
    // The coordinator's letter about the request, sent when the member asked.
    await page
      .getByRole('article', { name: /Tobiah Wrenfield asks for a packet of Dovecote Purple seed/ })
      .waitFor();
    await expectNoSeriousA11yViolations(page, 'mailbox at 360 px');
    await phone.close();
    await desk.close();
  });
});

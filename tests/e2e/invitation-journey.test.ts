/**
 * The invitation journey in a real browser against the built app: a lead invites a grower for
 * one site, the grower opens the letter in the development mailbox, signs up through the link
 * and lands in the trial with a grower's permissions only. Also: a signed-out visitor of a
 * protected page is sent to sign in and brought back.
 */
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

let live: LiveApp;
let browser: Browser;
const lead = demoAccounts.find((a) => a.key === 'lead')!;
const viewer = demoAccounts.find((a) => a.key === 'viewer')!;
const slug = 'larkhaven-okra-2026';
/** The browser logs the 401 of "who is signed in?" while signed out; that is an answer, not a fault. */
const signedOutProbe = (e: string) => e.includes('status of 401 (Unauthorized)');

beforeAll(async () => {
  ({ live, browser } = await openBrowserSuite({ demo: true }));
});
afterAll(() => closeBrowserSuite(live, browser));

describe('inviting a grower', () => {
  it('goes from the lead’s invitation to the grower working in the trial', async () => {
    const inviteeEmail = 'fenna.brackwater@larkhaven-seeds.example';

    // The lead, on a desktop screen.
    const leadContext = await contextAs(browser, live, lead);
    const leadPage = await leadContext.newPage();
    const leadErrors = watchErrors(leadPage);
    await leadPage.goto(`/t/${slug}`);
    await leadPage
      .getByRole('navigation', { name: 'Main' })
      .getByRole('link', { name: 'Members' })
      .click();
    await leadPage.getByRole('heading', { level: 1, name: 'Members' }).waitFor();
    const inviteForm = leadPage.getByRole('form', { name: 'Invite someone' });
    await inviteForm.getByLabel('Their e-mail address').fill(inviteeEmail);
    await inviteForm.getByLabel('Role', { exact: true }).selectOption('grower');
    await inviteForm.getByRole('checkbox', { name: 'Mill Pond Garden' }).check();
    await inviteForm.getByRole('button', { name: 'Send invitation' }).click();
    await leadPage
      .getByRole('status')
      .filter({ hasText: `Invitation to ${inviteeEmail} saved; the mail is on its way.` })
      .waitFor();
    await leadPage.getByRole('heading', { name: 'Open invitations' }).waitFor();
    await leadPage.getByText(inviteeEmail, { exact: true }).first().waitFor();
    // The queue sends it; the lead sees that it went.
    const mailPanel = leadPage.getByRole('region', { name: 'Mail from this trial' });
    await mailPanel.getByText('0 waiting · 1 sent · 0 not sent').waitFor({ timeout: 20_000 });
    await mailPanel.getByText(/^Sent /).waitFor();
    await expectNoSeriousA11yViolations(leadPage);
    await screenshot(leadPage, 'members-after-invite-1280');
    expect(leadErrors).toEqual([]);
    await leadContext.close();

    // The grower, signed out, on a 360 px phone.
    const phone = await contextAs(browser, live, null, { width: 360, height: 780 });
    const page = await phone.newPage();
    const errors = watchErrors(page);
    await page.goto('/dev/mailbox');
    const letter = page.getByRole('article', {
      name: /invites you to “Larkhaven heirloom okra, three gardens”/,
    });
    await letter.waitFor();
    await letter.getByRole('link', { name: /\/invitations\/accept#token=/ }).click();

    await page.getByRole('heading', { name: 'Invitation to a trial' }).waitFor();
    await page.getByText('Your sites: Mill Pond Garden').waitFor();
    await page.getByLabel('Your name').fill('Fenna Brackwater');
    await page.getByLabel('Choose a password').fill('short');
    await page.getByRole('button', { name: 'Create account and join' }).click();
    // The shared schema answers before the server is asked.
    await page.getByText('Use at least 10 characters.').waitFor();
    await page.getByLabel('Choose a password').fill('mill-pond-okra-rows');
    await page.getByRole('button', { name: 'Create account and join' }).click();

    await page.waitForURL((u) => u.pathname === `/t/${slug}`);
    await page
      .getByRole('heading', { level: 1, name: 'Larkhaven heirloom okra, three gardens' })
      .waitFor();
    // Signed in as the new grower, whose menu shows their initial.
    await page.getByText('F', { exact: true }).first().waitFor();
    // A grower does not manage members: no link, and the page says so.
    await expect(
      page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Members' }).count(),
    ).resolves.toBe(0);
    const permissions = await page.evaluate(async (s) => {
      const res = await fetch(`/api/trials/${s}`);
      return (await res.json()).permissions as Record<string, boolean>;
    }, slug);
    expect(permissions).toMatchObject({
      'trial.read': true,
      'records.write': true,
      'photos.upload': true,
      'trial.edit': false,
      'trial.publish': false,
      'members.manage': false,
    });
    const scrollWidth = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(scrollWidth).toBeLessThanOrEqual(360);
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'grower-joined-360');

    // The link worked once.
    const row = await live.db
      .selectFrom('invitations')
      .select(['accepted_at', 'accepted_by'])
      .where('email', '=', inviteeEmail)
      .executeTakeFirstOrThrow();
    expect(row.accepted_at).not.toBeNull();
    const sites = await live.db
      .selectFrom('trial_member_sites as s')
      .innerJoin('sites', 'sites.id', 's.site_id')
      .select('sites.name')
      .where('s.user_id', '=', row.accepted_by!)
      .execute();
    expect(sites.map((s) => s.name)).toEqual(['Mill Pond Garden']);
    expect(errors.filter((e) => !signedOutProbe(e))).toEqual([]);

    // Opening the members page anyway: the server refuses (403) and the page says why.
    await page.goto(`/t/${slug}/members`);
    await page.getByText('Only the trial’s leads manage its members and invitations.').waitFor();
    await phone.close();
  });
});

describe('protected pages', () => {
  it('send a signed-out visitor to sign in, by keyboard, and back to the page they wanted', async () => {
    const context = await contextAs(browser, live, null, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto('/account');
    await page.waitForURL((u) => u.pathname === '/sign-in' && u.search === '?next=%2Faccount');
    await page.getByText('Sign in to open that page.').waitFor();

    await page.getByLabel('E-mail address').focus();
    await page.keyboard.type(viewer.email);
    await page.keyboard.press('Tab');
    await page.keyboard.type('wrong-password-here');
    await page.keyboard.press('Enter');
    await page.getByRole('alert').filter({ hasText: 'do not match an account' }).waitFor();

    await page.getByLabel('Password').fill(viewer.password);
    await page.keyboard.press('Enter');
    await page.waitForURL((u) => u.pathname === '/account');
    await page.getByRole('heading', { level: 1, name: 'Your account' }).waitFor();
    await page.getByRole('main').getByText(viewer.email).waitFor();

    // Units preference, saved on the server.
    await page.getByLabel(/US customary/).check();
    await page.getByRole('button', { name: 'Save' }).click();
    await page.getByRole('status').filter({ hasText: 'Saved.' }).waitFor();
    const me = await page.evaluate(async () => (await fetch('/api/me')).json());
    expect(me.unitSystem).toBe('us');
    await expectNoSeriousA11yViolations(page);
    await screenshot(page, 'account-360');

    await page.goto('/sign-out');
    await page.getByRole('button', { name: 'Sign out on this device' }).click();
    await page.getByRole('heading', { name: 'You are signed out' }).waitFor();
    expect(errors.filter((e) => !signedOutProbe(e))).toEqual([]);
    await context.close();
  });

  it('shows the signed-in page on a reload right after signing in', async () => {
    // The device's stored copy of the cache is written at most once a second: a reload in that
    // second used to restore the signed-out answer as fresh and offer no way to sign out.
    const context = await contextAs(browser, live, null, { width: 360, height: 780 });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto('/account');
    await page.waitForURL((u) => u.pathname === '/sign-in');
    await page.waitForFunction(() =>
      (localStorage.getItem('rowtally-cache') ?? '').includes('"queryKey":["session","me"]'),
    );
    await page.getByLabel('E-mail address').fill(viewer.email);
    await page.getByLabel('Password').fill(viewer.password);
    await page.keyboard.press('Enter');
    await page.waitForURL((u) => u.pathname === '/account');
    await page.goto('/sign-out');
    await page.getByText(`Signed in as ${viewer.email}.`).waitFor();
    await page.getByRole('button', { name: 'Sign out on this device' }).click();
    await page.getByRole('heading', { name: 'You are signed out' }).waitFor();
    expect(errors.filter((e) => !signedOutProbe(e))).toEqual([]);
    await context.close();
  });
});

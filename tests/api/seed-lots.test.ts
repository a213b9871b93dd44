/**
 * A group's seed: lots and germination tests, the lot each trial entry was sown from with the
 * stand its plots made, and offers of packets that members ask for and coordinators answer by
 * mail. Each role is tried: group coordinator (the demo lead), trial lead who is a plain group
 * member, grower, outsider and signed out.
 *
 * The germination interval is the 95 % Wilson score interval, checked against Newcombe (1998),
 * "Two-sided confidence intervals for the single proportion", Statistics in Medicine 17:857–872,
 * method 3 (15 of 148: 0.0624 to 0.1605; quoted from memory, and R's prop.test agrees in
 * tests/unit/germination.test.ts). Stand percentages are checked against the plots' own counts.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { seedDemo } from '../../db/seed/seed';
import { publishDemoSheet } from '../../db/seed/demo-sheet';
import { demoLots, seedDemoSeedLots } from '../../db/seed/demo-seed-lots';
import {
  createTestApp,
  createUser,
  mintSessionCookie,
  TEST_ORIGIN,
  type TestApp,
} from '../support/test-app';
import { type CaptureServer, startCaptureServer } from '../../server/mail/capture-server';

const OKRA = 'larkhaven-okra-2026';
const BEAN = 'fennick-bush-beans-2026';
const VARIETY = 'velvet-lantern';
let t: TestApp;
const cookies: Record<string, string | null> = { signedOut: null };
let outsiderId = '';

beforeAll(async () => {
  t = await createTestApp();
  await seedDemo(t.db);
  await publishDemoSheet(t.db);
  await seedDemoSeedLots(t.db);
  for (const a of demoAccounts) cookies[a.key] = await mintSessionCookie(t, a);
  const trialLead = await createUser(t.db, { name: 'Odile Fairbairn' });
  const okra = await t.db
    .selectFrom('trials')
    .select('id')
    .where('slug', '=', OKRA)
    .executeTakeFirstOrThrow();
  await t.db
    .insertInto('trial_members')
    .values({ trial_id: okra.id, user_id: trialLead.id, role: 'lead' })
    .execute();
  const group = await t.db.selectFrom('groups').select('id').executeTakeFirstOrThrow();
  await t.db
    .insertInto('group_members')
    .values({ group_id: group.id, user_id: trialLead.id, role: 'member' })
    .execute();
  cookies.trialLead = await mintSessionCookie(t, trialLead);
  const outsider = await createUser(t.db, { name: 'Nell Outby' });
  outsiderId = outsider.id;
  cookies.outsider = await mintSessionCookie(t, outsider);
}, 60_000);
afterAll(async () => {
  await t.close();
});

const as = (who: string) => {
  const cookie = cookies[who] ?? null;
  const withCookie = (r: request.Test) => (cookie ? r.set('Cookie', cookie) : r);
  return {
    get: (url: string) => withCookie(request(t.app).get(url)),
    send: (method: 'post' | 'patch' | 'put' | 'delete', url: string, body?: object) =>
      withCookie(request(t.app)[method](url).set('Origin', TEST_ORIGIN)).send(body),
  };
};
const groupId = async () =>
  (await t.db.selectFrom('groups').select('id').executeTakeFirstOrThrow()).id;
const fieldsOf = (res: request.Response) =>
  (res.body.error.details.fields as { path: string }[]).map((f) => f.path);

async function newLot(label: string, extra: object = {}) {
  const res = await as('lead').send('post', `/api/varieties/${VARIETY}/seed/lots`, {
    label,
    source: 'Own harvest, Quarry Lane',
    harvestYear: 2025,
    amount: 42.5,
    amountUnit: 'g',
    storagePlace: 'Tin 3, cool shelf',
    ...extra,
  });
  expect(res.status).toBe(201);
  return res.body.id as string;
}
const lotIn = async (id: string, who = 'lead') => {
  const res = await as(who).get(`/api/varieties/${VARIETY}/seed`);
  expect(res.status).toBe(200);
  return (res.body.lots as { id: string }[]).find((l) => l.id === id) as never as {
    id: string;
    amount: number;
    tests: { percent: number; lowerPercent: number; upperPercent: number; testedOn: string }[];
    warnings: { kind: string; message: string }[];
    sown: {
      trialSlug: string;
      entryName: string;
      plots: { plantsSet: number | null; plantsSurviving: number | null }[];
      standPercent: number | null;
    }[];
  };
};

describe('the demo seed library', () => {
  it('has a tested lot for a few varieties, okra entries sown from them, and one open offer', async () => {
    const velvet = await as('grower').get('/api/varieties/velvet-lantern/seed');
    const lot = velvet.body.lots.find((l: { label: string }) => l.label === 'VL-25');
    expect(lot.tests[0]).toMatchObject({ seedsTested: 50, seedsGerminated: 46, percent: 92 });
    expect(lot.sown.map((s: { trialSlug: string }) => s.trialSlug)).toEqual([OKRA]);
    const mossbank = await as('grower').get('/api/varieties/mossbank-long/seed');
    // 71 of 100 is below the default 80 %, and a March 2025 test is over a year old by now.
    expect(mossbank.body.lots[0].warnings.map((w: { kind: string }) => w.kind)).toContain(
      'below_threshold',
    );
    const offered = demoLots.filter((d) => d.offer);
    expect(offered).toHaveLength(1);
    const sheet = await as('signedOut').get(`/api/seed/offers?trial=${BEAN}`);
    expect(sheet.body.offers).toEqual([
      expect.objectContaining({ varietyName: 'Dovecote Purple', packetsLeft: 12 }),
    ]);
  });
});

describe('seed lots and germination tests', () => {
  it('lets the coordinator keep lots; members read; outsiders and the signed-out see nothing', async () => {
    const id = await newLot('VL-2025-A');
    expect((await lotIn(id, 'grower')).amount).toBe(42.5);
    for (const who of ['grower', 'trialLead'])
      expect(
        (
          await as(who).send('post', `/api/varieties/${VARIETY}/seed/lots`, {
            label: 'X',
            amountUnit: 'g',
          })
        ).status,
      ).toBe(403);
    for (const who of ['outsider', 'signedOut']) {
      expect((await as(who).get(`/api/varieties/${VARIETY}/seed`)).status).toBe(404);
      expect((await as(who).send('patch', `/api/seed/lots/${id}`, { notes: 'x' })).status).toBe(
        404,
      );
    }
    expect((await as('grower').send('patch', `/api/seed/lots/${id}`, { notes: 'x' })).status).toBe(
      403,
    );
  });

  it('refuses bad lots and tests with the field and a message, writing nothing', async () => {
    const url = `/api/varieties/${VARIETY}/seed/lots`;
    const neg = await as('lead').send('post', url, { label: 'Bad', amount: -1, amountUnit: 'g' });
    expect(neg.status).toBe(400);
    expect(fieldsOf(neg)).toContain('body.amount');
    const half = await as('lead').send('post', url, {
      label: 'Bad',
      amount: 10.5,
      amountUnit: 'seeds',
    });
    expect(half.status).toBe(400);
    expect(half.body.error.details.fields[0]).toMatchObject({
      path: 'body.amount',
      message: 'A count of seeds is a whole number.',
    });
    const dup = await as('lead').send('post', url, { label: 'VL-2025-A', amountUnit: 'g' });
    expect(dup.status).toBe(409);
    expect(fieldsOf(dup)).toEqual(['body.label']);

    const lot = await newLot('VL-bad-tests');
    const more = await as('lead').send('post', `/api/seed/lots/${lot}/tests`, {
      testedOn: '2026-03-01',
      seedsTested: 50,
      seedsGerminated: 51,
      days: 10,
    });
    expect(more.status).toBe(400);
    expect(more.body.error.details.fields[0]).toMatchObject({
      path: 'body.seedsGerminated',
      message: 'More seeds cannot germinate than were tested.',
    });
    const late = await as('lead').send('post', `/api/seed/lots/${lot}/tests`, {
      testedOn: '2999-01-01',
      seedsTested: 50,
      seedsGerminated: 40,
      days: 10,
    });
    expect(late.status).toBe(400);
    expect(fieldsOf(late)).toEqual(['body.testedOn']);
    expect((await lotIn(lot)).tests).toEqual([]);
    // A change of unit alone is checked against the stored amount (42.5 g is no count of seeds).
    const recount = await as('lead').send('patch', `/api/seed/lots/${lot}`, {
      amountUnit: 'seeds',
    });
    expect(recount.status).toBe(400);
    expect(fieldsOf(recount)).toEqual(['body.amount']);
    expect((await lotIn(lot)).amount).toBe(42.5);
  });

  it('gives each test its percent and 95 % Wilson interval, newest first', async () => {
    const lot = await newLot('VL-2024');
    const add = (testedOn: string, seedsTested: number, seedsGerminated: number) =>
      as('lead').send('post', `/api/seed/lots/${lot}/tests`, {
        testedOn,
        seedsTested,
        seedsGerminated,
        days: 14,
      });
    expect((await add('2025-02-01', 148, 15)).status).toBe(201);
    expect((await add('2026-02-01', 50, 47)).status).toBe(201);
    const { tests } = await lotIn(lot);
    expect(tests.map((x) => x.testedOn)).toEqual(['2026-02-01', '2025-02-01']);
    // Newcombe (1998), method 3: 15 of 148 → 0.0624 to 0.1605.
    expect(tests[1]!.percent).toBeCloseTo((100 * 15) / 148, 10);
    expect(tests[1]!.lowerPercent).toBeCloseTo(6.24, 2);
    expect(tests[1]!.upperPercent).toBeCloseTo(16.05, 2);
    // R 4.2.2 prop.test(47, 50, correct = FALSE): 0.8378 to 0.9794 (fixtures/germination/wilson.json).
    expect(tests[0]!.percent).toBe(94);
    expect(tests[0]!.lowerPercent).toBeCloseTo(83.78, 2);
    expect(tests[0]!.upperPercent).toBeCloseTo(97.94, 2);
  });

  it('deletes a germination test entered by mistake (coordinators only), and the lot’s warnings follow', async () => {
    const lot = await newLot('VL-mistyped');
    const add = (testedOn: string, seedsGerminated: number) =>
      as('lead').send('post', `/api/seed/lots/${lot}/tests`, {
        testedOn,
        seedsTested: 100,
        seedsGerminated,
        days: 10,
      });
    const good = (await add('2026-09-01', 91)).body.id as string;
    // Typed 19 for 91: the newest test is then below the 80 % threshold (common practice, no source).
    const slip = (await add('2026-09-02', 19)).body.id as string;
    expect((await lotIn(lot)).warnings.map((w) => w.kind)).toEqual(['below_threshold']);
    const url = `/api/seed/lots/${lot}/tests/${slip}`;
    expect((await as('grower').send('delete', url)).status).toBe(403);
    expect((await as('outsider').send('delete', url)).status).toBe(404);
    expect((await as('signedOut').send('delete', url)).status).toBe(404);
    // A test of another lot is not this lot's to delete.
    const other = await newLot('VL-other');
    expect((await as('lead').send('delete', `/api/seed/lots/${other}/tests/${slip}`)).status).toBe(
      404,
    );
    expect((await as('lead').send('delete', url)).status).toBe(204);
    const after = await lotIn(lot);
    expect(after.tests.map((x) => x.testedOn)).toEqual(['2026-09-01']);
    expect(after.warnings).toEqual([]);
    expect((await as('lead').send('delete', url)).status).toBe(404);
    expect(good).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('warns when a lot is untested, its last test is over a year old, or below the group’s threshold', async () => {
    const untested = await newLot('VL-untested');
    expect((await lotIn(untested)).warnings.map((w) => w.kind)).toEqual(['untested']);

    const old = await newLot('VL-old');
    await as('lead').send('post', `/api/seed/lots/${old}/tests`, {
      testedOn: '2020-04-01',
      seedsTested: 100,
      seedsGerminated: 70,
      days: 10,
    });
    // 70 % is below the default 80 % threshold (common practice, no source), and 2020 is long ago.
    expect((await lotIn(old)).warnings.map((w) => w.kind)).toEqual(['test_old', 'below_threshold']);

    const settings = `/api/seed/groups/${await groupId()}/settings`;
    expect(
      (await as('grower').send('patch', settings, { germinationThresholdPercent: 60 })).status,
    ).toBe(403);
    expect(
      (await as('outsider').send('patch', settings, { germinationThresholdPercent: 60 })).status,
    ).toBe(404);
    const bad = await as('lead').send('patch', settings, { germinationThresholdPercent: 101 });
    expect(bad.status).toBe(400);
    expect(fieldsOf(bad)).toEqual(['body.germinationThresholdPercent']);
    expect(
      (await as('lead').send('patch', settings, { germinationThresholdPercent: 60 })).status,
    ).toBe(204);
    expect((await lotIn(old)).warnings.map((w) => w.kind)).toEqual(['test_old']);
    const seed = await as('grower').get(`/api/varieties/${VARIETY}/seed`);
    expect(seed.body.settings.germinationThresholdPercent).toBe(60);
    await as('lead').send('patch', settings, { germinationThresholdPercent: 80 });
  });

  it('links a trial entry to the lot it was sown from and shows the stand of its plots', async () => {
    const lot = await newLot('VL-sown');
    const lots = await as('lead').get(`/api/trials/${OKRA}/entry-lots`);
    expect(lots.status).toBe(200);
    const entry = (
      lots.body.entries as {
        entryId: string;
        variety: { slug: string } | null;
        lots: { id: string }[];
      }[]
    ).find((e) => e.variety?.slug === VARIETY)!;
    expect(entry.lots.map((l) => l.id)).toContain(lot);
    const other = lots.body.entries.find(
      (e: { variety: { slug: string } | null }) => e.variety && e.variety.slug !== VARIETY,
    );
    const url = `/api/trials/${OKRA}/entry-lots/${entry.entryId}`;
    // Another variety's lot is refused on the field.
    const otherLot = (
      await as('lead').send('post', `/api/varieties/${other.variety.slug}/seed/lots`, {
        label: 'Other',
        amountUnit: 'seeds',
        amount: 200,
      })
    ).body.id;
    const wrong = await as('lead').send('put', url, { lotId: otherLot });
    expect(wrong.status).toBe(400);
    expect(fieldsOf(wrong)).toEqual(['body.lotId']);
    expect((await as('grower').send('put', url, { lotId: lot })).status).toBe(403);
    expect((await as('outsider').send('put', url, { lotId: lot })).status).toBe(404);
    expect((await as('trialLead').send('put', url, { lotId: lot })).status).toBe(204);

    const plots = await t.db
      .selectFrom('plots')
      .select(['plants_set', 'plants_surviving'])
      .where('entry_id', '=', entry.entryId)
      .execute();
    const withBoth = plots.filter((p) => p.plants_set && p.plants_surviving !== null);
    expect(withBoth.length).toBeGreaterThan(0);
    const expected =
      (100 * withBoth.reduce((s, p) => s + p.plants_surviving!, 0)) /
      withBoth.reduce((s, p) => s + p.plants_set!, 0);
    const { sown } = await lotIn(lot);
    expect(sown).toHaveLength(1);
    expect(sown[0]).toMatchObject({ trialSlug: OKRA });
    expect(sown[0]!.plots).toHaveLength(plots.length);
    expect(sown[0]!.standPercent).toBeCloseTo(expected, 10);

    // An entry moved to another variety no longer claims the old variety's lot.
    await t.db
      .updateTable('entries')
      .set({
        variety_id: other.variety
          ? (
              await t.db
                .selectFrom('varieties')
                .select('id')
                .where('slug', '=', other.variety.slug)
                .executeTakeFirstOrThrow()
            ).id
          : null,
      })
      .where('id', '=', entry.entryId)
      .execute();
    const moved = await t.db
      .selectFrom('entries')
      .select('lot_id')
      .where('id', '=', entry.entryId)
      .executeTakeFirstOrThrow();
    expect(moved.lot_id).toBeNull();
    const back = await t.db
      .selectFrom('varieties')
      .select('id')
      .where('slug', '=', VARIETY)
      .executeTakeFirstOrThrow();
    await t.db
      .updateTable('entries')
      .set({ variety_id: back.id })
      .where('id', '=', entry.entryId)
      .execute();
  });
});

describe('seed offers and requests', () => {
  const BEAN_VARIETY = 'silverfern-bush';
  let offerId = '';
  let lotId = '';

  it('lets the coordinator offer packets from a lot, one open offer per variety', async () => {
    lotId = (
      await as('lead').send('post', `/api/varieties/${BEAN_VARIETY}/seed/lots`, {
        label: 'SB-2026',
        amountUnit: 'seeds',
        amount: 400,
      })
    ).body.id;
    const url = `/api/varieties/${BEAN_VARIETY}/seed/offers`;
    expect((await as('grower2').send('post', url, { lotId, packets: 2 })).status).toBe(403);
    expect((await as('outsider').send('post', url, { lotId, packets: 2 })).status).toBe(404);
    const zero = await as('lead').send('post', url, { lotId, packets: 0 });
    expect(zero.status).toBe(400);
    expect(fieldsOf(zero)).toEqual(['body.packets']);
    const made = await as('lead').send('post', url, { lotId, packets: 2, note: 'Saved 2026.' });
    expect(made.status).toBe(201);
    offerId = made.body.id;
    const again = await as('lead').send('post', url, { lotId, packets: 3 });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already has an open offer/);
  });

  it('shows an open offer to anyone, and lists it for the published sheet', async () => {
    const view = await as('signedOut').get(`/api/seed/offers/${offerId}`);
    expect(view.status).toBe(200);
    expect(view.body).toMatchObject({
      packetsLeft: 2,
      canRequest: false,
      whyNot: 'Sign in to ask for a packet.',
    });
    const sheet = await as('signedOut').get(`/api/seed/offers?trial=${BEAN}`);
    expect(sheet.status).toBe(200);
    expect(sheet.body.offers.map((o: { id: string }) => o.id)).toContain(offerId);
    expect((await as('signedOut').get(`/api/seed/offers?trial=${OKRA}`)).status).toBe(404);
  });

  it('takes one packet per request, never more than are left (409), and one request each', async () => {
    const url = `/api/seed/offers/${offerId}/requests`;
    const body = { shipTo: '14 Orchard Row, Larkhaven', message: 'For the school beds.' };
    expect((await as('signedOut').send('post', url, body)).status).toBe(401);
    const outsider = await as('outsider').send('post', url, body);
    expect(outsider.status).toBe(403);
    const blank = await as('grower').send('post', url, { shipTo: '  ' });
    expect(blank.status).toBe(400);
    expect(fieldsOf(blank)).toEqual(['body.shipTo']);
    expect((await as('grower').send('post', url, body)).status).toBe(201);
    // The group's coordinator hears of it by mail, with the note and where to answer; the
    // postal address stays in the app.
    const told = await t.mailbox.waitFor(
      (m) =>
        m.to.includes('marisol@larkhaven-seeds.example') && m.subject.includes('Tobiah Wrenfield'),
    );
    expect(told.subject).toBe('Tobiah Wrenfield asks for a packet of Silverfern Bush seed');
    expect(told.text).toContain('For the school beds.');
    expect(told.text).toContain('1 packet is left of this offer.');
    expect(told.text).toContain(`${TEST_ORIGIN}/varieties/silverfern-bush/seed`);
    expect(told.text).not.toContain('14 Orchard Row');
    const twice = await as('grower').send('post', url, body);
    expect(twice.status).toBe(409);
    expect(twice.body.error.message).toMatch(/already asked/);
    expect((await as('contributor').send('post', url, body)).status).toBe(201);
    const none = await as('grower2').send('post', url, body);
    expect(none.status).toBe(409);
    expect(none.body.error.message).toBe('No packets are left of this offer.');
    expect((await as('grower2').get(`/api/seed/offers/${offerId}`)).body).toMatchObject({
      packetsLeft: 0,
      canRequest: false,
    });
    // One letter per request taken, none for the refused ones.
    await t.mailSettled();
    const asked = t.mailbox
      .messages()
      .filter((m) => m.to.includes('marisol@larkhaven-seeds.example'))
      .map((m) => m.subject)
      .filter((s) => s.includes('asks for a packet'));
    expect(asked.sort()).toEqual([
      'Jun Halloway asks for a packet of Silverfern Bush seed',
      'Tobiah Wrenfield asks for a packet of Silverfern Bush seed',
    ]);
  });

  it('lets anyone with a confirmed e-mail ask when the group allows it', async () => {
    const settings = `/api/seed/groups/${await groupId()}/settings`;
    await as('lead').send('patch', settings, { requestsOpen: true });
    // A fresh offer with a packet left: the outsider (confirmed e-mail, in no group) asks and is heard.
    const made = await as('lead').send('post', '/api/varieties', {
      groupId: await groupId(),
      name: 'Ashgrove Runner',
      crop: 'Bean',
    });
    expect(made.status).toBe(201);
    const seed = `/api/varieties/${made.body.slug}/seed`;
    const lot = await as('lead').send('post', `${seed}/lots`, {
      label: 'AR-2026',
      amountUnit: 'seeds',
      amount: 60,
    });
    const offer = await as('lead').send('post', `${seed}/offers`, {
      lotId: lot.body.id,
      packets: 1,
    });
    expect(offer.status).toBe(201);
    const open = await as('outsider').send('post', `/api/seed/offers/${offer.body.id}/requests`, {
      shipTo: '2 Weir Cottages, Dunmarsh',
    });
    expect(open.status).toBe(201);
    const view = await as('outsider').get(`/api/seed/offers/${offerId}`);
    expect(view.body.whyNot).toBe('No packets are left.');
    await t.db
      .updateTable('users')
      .set({ email_verified: false })
      .where('id', '=', outsiderId)
      .execute();
    expect((await as('outsider').get(`/api/seed/offers/${offerId}`)).body.whyNot).toMatch(
      /Confirm your e-mail/,
    );
    await as('lead').send('patch', settings, { requestsOpen: false });
  });

  it('lists requests for the coordinator, who answers each once; the requester gets mail', async () => {
    const list = `/api/seed/offers/${offerId}/requests`;
    expect((await as('grower').get(list)).status).toBe(403);
    expect((await as('outsider').get(list)).status).toBe(404);
    const res = await as('lead').get(list);
    expect(res.status).toBe(200);
    const byName = (name: string) =>
      res.body.requests.find((r: { requester: { name: string } }) => r.requester.name === name);
    const tobiah = byName('Tobiah Wrenfield');
    const jun = byName('Jun Halloway');
    expect(tobiah).toMatchObject({ status: 'requested', shipTo: '14 Orchard Row, Larkhaven' });

    expect(
      (await as('grower').send('patch', `/api/seed/requests/${jun.id}`, { status: 'sent' })).status,
    ).toBe(403);
    const bad = await as('lead').send('patch', `/api/seed/requests/${jun.id}`, { status: 'lost' });
    expect(bad.status).toBe(400);
    expect(fieldsOf(bad)).toEqual(['body.status']);

    expect(
      (
        await as('lead').send('patch', `/api/seed/requests/${tobiah.id}`, {
          status: 'sent',
          answer: 'Posted Monday.',
        })
      ).status,
    ).toBe(204);
    const sent = await t.mailbox.waitFor(
      (m) =>
        m.to.includes('tobiah@larkhaven-seeds.example') && m.subject.includes('Silverfern Bush'),
    );
    expect(sent.subject).toBe('Your Silverfern Bush seed is on its way');
    expect(sent.text).toContain('Posted Monday.');
    expect(sent.text).toContain(`/offers/${offerId}`);

    expect(
      (await as('lead').send('patch', `/api/seed/requests/${jun.id}`, { status: 'declined' }))
        .status,
    ).toBe(204);
    const declined = await t.mailbox.waitFor(
      (m) => m.to.includes('jun@larkhaven-seeds.example') && m.subject.includes('Silverfern Bush'),
    );
    expect(declined.subject).toBe('Your request for Silverfern Bush seed');
    // A declined packet goes back to the offer.
    expect((await as('lead').get(`/api/seed/offers/${offerId}`)).body.packetsLeft).toBe(1);
    const again = await as('lead').send('patch', `/api/seed/requests/${jun.id}`, {
      status: 'sent',
    });
    expect(again.status).toBe(409);
    const mine = await as('grower').get(`/api/seed/offers/${offerId}`);
    expect(mine.body.myRequest).toMatchObject({ status: 'sent', answer: 'Posted Monday.' });
  });

  it('closes an offer: no more requests, and the sheet no longer links to it', async () => {
    expect(
      (await as('grower').send('patch', `/api/seed/offers/${offerId}`, { status: 'closed' }))
        .status,
    ).toBe(403);
    expect(
      (await as('lead').send('patch', `/api/seed/offers/${offerId}`, { status: 'open' })).status,
    ).toBe(400);
    expect(
      (await as('lead').send('patch', `/api/seed/offers/${offerId}`, { status: 'closed' })).status,
    ).toBe(204);
    const res = await as('grower2').send('post', `/api/seed/offers/${offerId}/requests`, {
      shipTo: 'Mill Pond',
    });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe('This offer is closed.');
    const sheet = await as('signedOut').get(`/api/seed/offers?trial=${BEAN}`);
    expect(sheet.body.offers.map((o: { id: string }) => o.id)).not.toContain(offerId);
    expect((await as('signedOut').get(`/api/seed/offers/${offerId}`)).status).toBe(404);
    expect((await as('grower').get(`/api/seed/offers/${offerId}`)).status).toBe(200);
  });

  it('keeps a request while the mail relay is down, and tells the coordinator once it is back', async () => {
    const made = await as('lead').send('post', `/api/varieties/${BEAN_VARIETY}/seed/offers`, {
      lotId,
      packets: 1,
    });
    expect(made.status).toBe(201);
    const port = t.mailbox.port;
    await t.mailbox.close();
    let relay: CaptureServer | null = null;
    try {
      const res = await as('grower2').send('post', `/api/seed/offers/${made.body.id}/requests`, {
        shipTo: 'Mill Pond Cottage',
      });
      // The member is answered at once; the letter waits in the queue.
      expect(res.status).toBe(201);
      const letter = () =>
        t.db
          .selectFrom('outgoing_mail')
          .select(['status', 'attempts', 'last_error'])
          .where('kind', '=', 'seed_request_received')
          .where('subject', 'like', 'Ada Pellwright%')
          .executeTakeFirstOrThrow();
      await expect
        .poll(async () => (await letter()).attempts, { timeout: 10_000 })
        .toBeGreaterThanOrEqual(1);
      expect(await letter()).toMatchObject({ status: 'pending' });
      expect((await letter()).last_error).toMatch(/ECONNREFUSED/);
      const list = await as('lead').get(`/api/seed/offers/${made.body.id}/requests`);
      expect(list.body.requests).toEqual([
        expect.objectContaining({ shipTo: 'Mill Pond Cottage', status: 'requested' }),
      ]);

      relay = await startCaptureServer(port);
      const told = await relay.waitFor(
        (m) =>
          m.to.includes('marisol@larkhaven-seeds.example') &&
          m.subject.startsWith('Ada Pellwright'),
        20_000,
      );
      expect(told.subject).toMatch(/asks for a packet of Silverfern Bush seed$/);
      await expect.poll(async () => (await letter()).status, { timeout: 10_000 }).toBe('sent');
    } finally {
      await relay?.close();
    }
  });
});

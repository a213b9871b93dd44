/**
 * The journeys through nginx in front of three built instances sharing one database and one
 * bucket: each request goes to the next instance (nginx's round robin, its documented default
 * for an `upstream` block, ngx_http_upstream_module), so a session, an invitation, a record and a
 * photo made on one instance must be seen by the others. A record sent again with the same
 * client-made id is one record (RFC 9110 §9.2.2: a request repeated must have the effect of
 * one), which is what lets the field log replay a write that an instance died while answering.
 */
import crypto from 'node:crypto';
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoAccounts } from '../../db/seed/demo-season';
import { FAKE_S3_KEYS } from '../../scripts/cluster/fake-s3';
import { variantKey } from '../../server/photos/photos-service';
import { texturedPhoto } from '../support/textured-photo';
import {
  startTestCluster,
  type TestCluster,
  until,
  untilAcknowledged,
  untilEachInstanceAnswers,
  Visitor,
} from './support';

const SLUG = 'larkhaven-okra-2026';
const account = (key: string) => demoAccounts.find((a) => a.key === key)!;
let t: TestCluster;
let plotIds: string[];
let lead: Visitor;
let grower: Visitor;

const today = new Date().toISOString().slice(0, 10);
const harvest = (plotId: string, massG: number) => ({
  id: crypto.randomUUID(),
  plotId,
  harvestedOn: today,
  fruitCount: 7,
  massG,
  grade: 'marketable',
});

async function storedHarvests(ids: string[]) {
  if (ids.length === 0) return [];
  return t.db
    .selectFrom('harvests')
    .select(['id', 'mass_g'])
    .where('id', 'in', ids)
    .where('deleted_at', 'is', null)
    .execute();
}

beforeAll(async () => {
  t = await startTestCluster(3);
  plotIds = (
    await t.db
      .selectFrom('plots')
      .innerJoin('trials', 'trials.id', 'plots.trial_id')
      .select('plots.id')
      .where('trials.slug', '=', SLUG)
      .orderBy('plots.plot_number')
      .execute()
  ).map((p) => p.id);
  lead = new Visitor(t.cluster.url);
  grower = new Visitor(t.cluster.url);
  expect((await lead.signIn(account('lead').email, account('lead').password)).status).toBe(200);
  expect((await grower.signIn(account('grower2').email, account('grower2').password)).status).toBe(
    200,
  );
}, 300_000);

afterAll(async () => {
  await t?.close();
}, 120_000);

describe('through the balancer', () => {
  it('answers each request from the next instance in turn, and a session works on every one', async () => {
    const seen: string[] = [];
    for (let i = 0; i < 6; i++) {
      const me = await lead.call('GET', '/api/me');
      expect(me.status).toBe(200);
      expect(me.body.email).toBe(account('lead').email);
      seen.push(me.upstream);
    }
    expect(new Set(seen.slice(0, 3)).size).toBe(3);
    for (const [i, address] of seen.entries()) {
      expect(t.cluster.instanceAt(address)).toBeDefined();
      if (i >= 3) expect(address).toBe(seen[i - 3]);
    }
  });

  it('sends the invitation from one instance and the invitee joins through others', async () => {
    const email = `fen.${crypto.randomBytes(3).toString('hex')}@larkhaven-seeds.example`;
    const invited = await lead.call('POST', `/api/trials/${SLUG}/invitations`, {
      email,
      role: 'grower',
      siteIds: [],
    });
    expect(invited.status).toBe(201);
    const mail = await t.cluster.mailbox.waitFor((m) => m.to.includes(email), 30_000);
    const link = mail.links.find((l) => l.includes('/invitations/accept#token='))!;
    // Links in mail carry the one public address, whichever instance sent them.
    expect(link.startsWith(`${t.cluster.url}/`)).toBe(true);
    const token = new URL(link).hash.replace('#token=', '');

    const invitee = new Visitor(t.cluster.url);
    const joined = await invitee.call('POST', '/api/invitations/sign-up', {
      token,
      name: 'Fen Rushwick',
      password: 'okra-rows-forever',
    });
    expect(joined.status).toBe(201);
    const seen = await invitee.call('GET', `/api/trials/${SLUG}`);
    expect(seen.status).toBe(200);
    expect(seen.body.myRole).toBe('grower');
    expect(new Set([invited.upstream, joined.upstream, seen.upstream]).size).toBe(3);
  });

  it('stores a harvest round once, each record replayed to another instance', async () => {
    const round = plotIds.slice(0, 9).map((plotId, i) => harvest(plotId, 100 + i * 10.5));
    for (const body of round) {
      const first = await grower.call('POST', `/api/trials/${SLUG}/harvests`, body);
      expect(first.status).toBe(201);
      const replay = await grower.call('POST', `/api/trials/${SLUG}/harvests`, body);
      expect(replay.status).toBe(200);
      expect(replay.body.id).toBe(body.id);
      expect(replay.upstream).not.toBe(first.upstream);
    }
    const stored = await storedHarvests(round.map((h) => h.id));
    expect(stored).toHaveLength(round.length);
    for (const h of round)
      expect(Number(stored.find((s) => s.id === h.id)!.mass_g)).toBeCloseTo(h.massG, 9);
  });

  it('uploads a photo on one instance; every instance serves the same bytes from the bucket', async () => {
    const form = new FormData();
    form.append('caption', 'Pods on the drying rack');
    form.append('plotId', plotIds[0]!);
    form.append('subject', 'fruit');
    form.append(
      'photo',
      new Blob([new Uint8Array(await texturedPhoto(800, 600))], { type: 'image/jpeg' }),
      'IMG_0102.jpg',
    );
    const up = await lead.call('POST', `/api/trials/${SLUG}/photos`, form);
    expect(up.status, up.bytes.toString()).toBe(201);
    const photo = up.body.photos[0];

    const answers = [];
    for (let i = 0; i < 3; i++) answers.push(await lead.call('GET', photo.urls.original));
    expect(new Set(answers.map((a) => a.upstream)).size).toBe(3);
    for (const a of answers) {
      expect(a.status).toBe(200);
      expect(a.bytes.equals(answers[0]!.bytes)).toBe(true);
    }
    // What they serve is the object in the bucket, read back with the S3 protocol itself.
    const row = await t.db
      .selectFrom('photos')
      .select(['storage_key', 'original_ext'])
      .where('id', '=', photo.id)
      .executeTakeFirstOrThrow();
    const s3 = new S3Client({
      endpoint: t.cluster.bucket.endpoint,
      region: 'us-east-1',
      forcePathStyle: true,
      credentials: FAKE_S3_KEYS,
    });
    const got = await s3.send(
      new GetObjectCommand({ Bucket: t.cluster.bucket.name, Key: variantKey(row, 'original') }),
    );
    const inBucket = Buffer.from(await got.Body!.transformToByteArray());
    s3.destroy();
    expect(inBucket.equals(answers[0]!.bytes)).toBe(true);
  });

  it('publishes on one instance; every instance serves that version to readers', async () => {
    const draft = await lead.call('PUT', `/api/trials/${SLUG}/results-sheet`, {
      summary: 'Round-robin test season.',
      methods: null,
      traits: [{ key: 'marketable_yield', basis: 'plot', weight: 1 }],
      entryNotes: {},
      coverPhotos: {},
      alpha: 0.05,
      letters: 'hsd',
      license: 'CC-BY-4.0',
    });
    expect(draft.status, draft.bytes.toString()).toBe(200);
    const published = await lead.call('POST', `/api/trials/${SLUG}/results-sheet/publish`, {
      changeNote: 'Harvests of the balancer round.',
    });
    expect(published.status, published.bytes.toString()).toBe(201);
    const reader = new Visitor(t.cluster.url);
    const sheets = [];
    for (let i = 0; i < 3; i++) sheets.push(await reader.call('GET', `/api/results/${SLUG}`));
    expect(new Set(sheets.map((s) => s.upstream)).size).toBe(3);
    for (const s of sheets) {
      expect(s.status).toBe(200);
      expect(s.body.version).toBe(published.body.version);
      expect(s.body.traits).toEqual(sheets[0]!.body.traits);
    }
  });
});

describe('when an instance dies or is replaced', () => {
  it('finishes a harvest round while an instance is killed in the middle of it, losing nothing', async () => {
    const round = plotIds.slice(10, 40).map((plotId, i) => harvest(plotId, 200 + i));
    let acknowledged = 0;
    const tries: number[] = [];
    let killed: Promise<void> | undefined;
    // Six phones at once, each sending its records in turn.
    const queue = [...round];
    await Promise.all(
      Array.from({ length: 6 }, async () => {
        for (let body = queue.shift(); body; body = queue.shift()) {
          const sent = await untilAcknowledged(() =>
            grower.call('POST', `/api/trials/${SLUG}/harvests`, body),
          );
          tries.push(sent.tries);
          if (++acknowledged === 8) killed = t.cluster.stopInstance(1, 'SIGKILL');
        }
      }),
    );
    await killed;
    expect(t.cluster.instances[1]!.process).toBeUndefined();
    const stored = await storedHarvests(round.map((h) => h.id));
    expect(stored).toHaveLength(round.length);
    // The rest of the journey goes on over the two instances left.
    const after = [];
    for (let i = 0; i < 4; i++) after.push(await grower.call('GET', `/api/trials/${SLUG}`));
    expect(after.every((a) => a.status === 200)).toBe(true);
    expect(after.some((a) => a.upstream.endsWith(`:${t.cluster.instances[1]!.port}`))).toBe(false);
    await t.cluster.startInstance(1);
  }, 180_000);

  it('loses no acknowledged write and fails no read while every instance is restarted in turn', async () => {
    const acknowledgedIds: string[] = [];
    const readFailures: string[] = [];
    let reads = 0;
    let writing = true;
    const restart = t.cluster.rollingRestart().finally(() => (writing = false));
    let n = 0;
    const writer = async () => {
      while (writing) {
        const body = harvest(plotIds[40 + (n++ % 10)]!, 300 + n);
        await untilAcknowledged(() => grower.call('POST', `/api/trials/${SLUG}/harvests`, body));
        acknowledgedIds.push(body.id);
      }
    };
    const reader = async () => {
      // A connection per read; every read must be answered 200. A connection that fails before
      // any answer is tried once more on a new one, as browsers do for a GET (RFC 9110 §9.2.2:
      // idempotent requests may be retried automatically): nginx's old workers close their
      // connections while a reload hands over. An HTTP error is never retried.
      const visitor = new Visitor(t.cluster.url, { keepAlive: false });
      const read = () => visitor.call('GET', `/api/results/${SLUG}`);
      while (writing) {
        reads++;
        const sheet = await read()
          .catch(() => read())
          .catch((err: unknown) => String(err));
        if (typeof sheet === 'string') readFailures.push(sheet);
        else if (sheet.status !== 200) readFailures.push(`${sheet.status} from ${sheet.upstream}`);
      }
    };
    await Promise.all([restart, writer(), writer(), writer(), reader()]);
    expect(acknowledgedIds.length).toBeGreaterThan(10);
    expect(reads).toBeGreaterThan(10);
    expect(readFailures).toEqual([]);
    const stored = await storedHarvests(acknowledgedIds);
    expect(stored.map((s) => s.id).sort()).toEqual([...acknowledgedIds].sort());
    // Every instance is back in nginx's list, and each answers the same session again.
    await until('every instance is back in the balancer', () =>
      t.cluster.instances.every((i) => t.cluster.inBalancer().includes(i)),
    );
    const answered = await untilEachInstanceAnswers(
      t,
      () => lead.call('GET', '/api/me'),
      (me) => {
        expect(me.status).toBe(200);
        expect(me.body.email).toBe(account('lead').email);
      },
    );
    expect(answered.size).toBe(3);
  }, 480_000);
});

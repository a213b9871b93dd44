/**
 * The field log's outbox in a browser-like page (jsdom with an in-memory IndexedDB): entries
 * are kept first and sent after; a lost connection leaves them waiting; the server's refusal
 * is shown with its message; a retried entry carries the same id.
 */
import { render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '../../src/lib/api-client';
import {
  backoffMs,
  Outbox,
  type OutboxItem,
  type Upload,
} from '../../src/features/field-log/api/outbox';
import { OutboxPanel } from '../../src/features/field-log/components/outbox-panel';

let n = 0;
const opened: Outbox[] = [];
const wren = { id: 'acct-wren', name: 'Wren Alderby' };
const hollis = { id: 'acct-hollis', name: 'Hollis Marchetti' };
const me = (a: { id: string; name: string }) => ({
  ...a,
  email: `${a.id}@example.test`,
  emailVerified: true,
  unitSystem: 'metric',
  isAdmin: false,
});
/**
 * An outbox whose fetch answers the session question with `session.user` (the account the
 * browser's cookie belongs to) and every record with the next of `replies`.
 */
function outboxWith(
  replies: (() => Response | Promise<Response>)[],
  session: { user: { id: string; name: string } | null } = { user: wren },
) {
  const sent: { url: string; body: { id: string } }[] = [];
  const send = (async (url: string, init?: RequestInit) => {
    if (url === '/api/session') return json(200, { user: session.user ? me(session.user) : null });
    sent.push({ url, body: JSON.parse(String(init?.body)) });
    const reply = replies.shift();
    if (!reply) throw new Error('no reply left');
    return reply();
  }) as typeof fetch;
  const box = new Outbox(send, `outbox-test-${++n}`);
  opened.push(box);
  return { box, sent, session };
}
afterEach(() => {
  for (const b of opened.splice(0)) b.close();
  vi.unstubAllGlobals();
});
/** The multipart fields a form was given, in order: name, value and the file's name. */
class RecordingForm {
  parts: [string, string, string?][] = [];
  append(name: string, value: unknown, fileName?: string) {
    this.parts.push(fileName === undefined ? [name, String(value)] : [name, '(file)', fileName]);
  }
}

const entry = (id: string, label = `Plot 101 · harvest ${id}`) => ({
  id,
  trialSlug: 'brookfold',
  kind: 'harvest' as const,
  method: 'POST' as const,
  url: '/api/trials/brookfold/harvests',
  body: {
    id,
    plotId: 'p',
    harvestedOn: '2026-07-01',
    fruitCount: 3,
    massG: 40,
    grade: 'marketable',
  },
  label,
});
const json = (status: number, body: unknown) =>
  new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
const states = async (box: Outbox) =>
  Object.fromEntries((await box.list('brookfold')).map((i) => [i.id, i.state]));

describe('the outbox', () => {
  it('keeps an entry when the connection is down and sends the same id when it returns', async () => {
    const { box, sent } = outboxWith([
      () => {
        throw new TypeError('Failed to fetch');
      },
      () => json(201, { id: 'a' }),
    ]);
    await box.add([entry('a')], wren);
    await box.flush();
    const [waiting] = await box.list('brookfold');
    expect(waiting).toMatchObject({ state: 'waiting', attempts: 1 });
    expect(waiting!.message).toMatch(/kept on this device/);
    await box.retryNow();
    expect(await states(box)).toEqual({ a: 'saved' });
    expect(sent.map((s) => s.body.id)).toEqual(['a', 'a']);
  });

  it('shows the server refusal with its message and does not send it again', async () => {
    const { box, sent } = outboxWith([
      () =>
        json(400, {
          error: {
            code: 'validation_failed',
            message: 'Check body.massG',
            details: { fields: [{ path: 'body.massG', message: 'Mass cannot be negative.' }] },
          },
        }),
    ]);
    await box.add([entry('b')], wren);
    await box.flush();
    const [refused] = await box.list('brookfold');
    expect(refused).toMatchObject({ state: 'refused', message: 'Mass cannot be negative.' });
    await box.retryNow();
    expect(sent).toHaveLength(1);
  });

  it('waits and asks again after a server error or a lost sign-in', async () => {
    const { box } = outboxWith([
      () => json(503, { error: { code: 'internal', message: 'Busy' } }),
      () => json(401, { error: { code: 'unauthenticated', message: 'Sign in to do this.' } }),
      () => json(200, { id: 'c' }),
    ]);
    await box.add([entry('c')], wren);
    await box.flush();
    expect(await states(box)).toEqual({ c: 'waiting' });
    await box.retryNow();
    const [signedOut] = await box.list('brookfold');
    expect(signedOut!.message).toBe('Signed out: sign in again and it will be sent.');
    await box.retryNow();
    expect(await states(box)).toEqual({ c: 'saved' });
  });

  it('sends a round in the order it was entered', async () => {
    const { box, sent } = outboxWith(Array.from({ length: 5 }, () => () => json(201, {})));
    for (const id of ['r1', 'r2', 'r3', 'r4', 'r5']) await box.add([entry(id)], wren);
    await box.flush();
    await box.flush();
    expect(sent.map((s) => s.body.id)).toEqual(['r1', 'r2', 'r3', 'r4', 'r5']);
    expect(Object.values(await states(box))).toEqual(['saved', 'saved', 'saved', 'saved', 'saved']);
  });

  it('never sends an entry under another account, and sends it when its grower signs in again', async () => {
    const { box, sent, session } = outboxWith([() => json(201, {}), () => json(201, {})], {
      user: wren,
    });
    // Wren queues with no signal, signs out; Hollis signs in on the same phone.
    session.user = hollis;
    await box.add([entry('w1')], wren);
    await box.add([entry('h1')], hollis);
    await box.flush();
    await box.flush();
    expect(sent.map((s) => s.body.id)).toEqual(['h1']);
    expect(await states(box)).toEqual({ w1: 'waiting', h1: 'saved' });
    const w1 = (await box.list('brookfold')).find((i) => i.id === 'w1')!;
    expect(w1).toMatchObject({ accountId: 'acct-wren', accountName: 'Wren Alderby' });
    expect(w1.message).toBe(
      'Queued by Wren Alderby: kept on this device until Wren Alderby signs in again.',
    );
    // Signed out altogether: still waiting.
    session.user = null;
    await box.retryNow();
    expect(sent).toHaveLength(1);
    expect((await box.list('brookfold')).find((i) => i.id === 'w1')!.message).toBe(
      'Signed out: sign in again and it will be sent.',
    );
    session.user = wren;
    await box.retryNow();
    expect(sent.map((s) => s.body.id)).toEqual(['h1', 'w1']);
    expect(await states(box)).toEqual({ w1: 'saved', h1: 'saved' });
  });

  it('waits without sending when the session cannot be asked about', async () => {
    const { box, sent } = outboxWith([() => json(201, {})]);
    const quiet = new Outbox(
      (async () => {
        throw new TypeError('Failed to fetch');
      }) as typeof fetch,
      `outbox-test-${++n}`,
    );
    opened.push(quiet);
    await quiet.add([entry('q')], wren);
    await quiet.flush();
    const [q] = await quiet.list('brookfold');
    expect(q).toMatchObject({ state: 'waiting', attempts: 1 });
    expect(q!.message).toMatch(/kept on this device/);
    expect(sent).toHaveLength(0);
    void box;
  });

  it('sends a photo through the upload path with progress, and reads its refusal like any answer', async () => {
    const shares: (number | undefined)[] = [];
    const uploads: { url: string; fields: Record<string, string>; file: string }[] = [];
    let box: Outbox | null = null;
    const upload = (async (url, _schema, options) => {
      const form = options.body as unknown as RecordingForm;
      uploads.push({
        url,
        fields: Object.fromEntries(form.parts.filter((p) => p[0] !== 'photo')),
        file: form.parts.find((p) => p[0] === 'photo')![2]!,
      });
      options.onProgress?.({ loaded: 50, total: 200 });
      shares.push((await box!.list('brookfold'))[0]!.progress);
      if (uploads.length === 1)
        throw new ApiError(413, 'too_large', 'Too large.', {
          fields: [{ path: 'photo', message: 'The photo is larger than 15 MB.' }],
        });
      return {};
    }) as Upload;
    // jsdom's FormData refuses the Blob that comes back from the in-memory IndexedDB (a jsdom
    // limitation; a browser keeps it a Blob), so the form the outbox builds is recorded instead.
    vi.stubGlobal('FormData', RecordingForm);
    const send = (async () => json(200, { user: me(wren) })) as typeof fetch;
    box = new Outbox(send, `outbox-test-${++n}`, upload);
    opened.push(box);
    const photo = (id: string) => ({
      id,
      trialSlug: 'brookfold',
      kind: 'photo' as const,
      method: 'POST' as const,
      url: '/api/trials/brookfold/photos',
      body: { caption: 'Plot 101', takenOn: '2026-07-01', skipped: null },
      file: new Blob(['jpeg bytes'], { type: 'image/jpeg' }),
      fileName: `${id}.jpg`,
      label: `Plot 101 · photo ${id}`,
    });
    await box.add([photo('ph1')], wren);
    await box.flush();
    expect(await box.list('brookfold')).toMatchObject([
      { state: 'refused', message: 'The photo is larger than 15 MB.' },
    ]);
    await box.add([photo('ph2')], wren);
    await box.flush();
    expect(await states(box)).toEqual({ ph1: 'refused', ph2: 'saved' });
    expect(uploads).toEqual([
      {
        url: '/api/trials/brookfold/photos',
        // The queue's id goes as the upload's id, so a resend is recognised as the same upload.
        fields: { uploadId: 'ph1', caption: 'Plot 101', takenOn: '2026-07-01' },
        file: 'ph1.jpg',
      },
      {
        url: '/api/trials/brookfold/photos',
        // The queue's id goes as the upload's id, so a resend is recognised as the same upload.
        fields: { uploadId: 'ph2', caption: 'Plot 101', takenOn: '2026-07-01' },
        file: 'ph2.jpg',
      },
    ]);
    // A quarter of the bytes sent shows as 0.25 while the upload runs, and is gone after.
    expect(shares).toEqual([0.25, 0.25]);
    expect((await box.list('brookfold')).every((i) => i.progress === undefined)).toBe(true);
  });

  it('backs off 1, 2, 4 … seconds up to a minute (common practice, no source)', () => {
    expect([1, 2, 3, 4, 7, 8, 20].map(backoffMs)).toEqual([
      1000, 2000, 4000, 8000, 60_000, 60_000, 60_000,
    ]);
  });
});

describe('the queue on screen', () => {
  it('lists each entry with its state and the refusal message', () => {
    const base = {
      trialSlug: 'b',
      kind: 'harvest',
      method: 'POST',
      url: '',
      body: {},
      accountId: 'acct-wren',
      accountName: 'Wren Alderby',
      attempts: 1,
      nextTryAt: 0,
      createdAt: 0,
      savedAt: null,
    } as const;
    const items: OutboxItem[] = [
      { ...base, id: '1', label: 'Plot 101 · 12 fruit', state: 'saved', message: null },
      {
        ...base,
        id: '2',
        label: 'Plot 102 · 9 fruit',
        state: 'waiting',
        message: 'No connection; kept on this device and sent when the signal returns.',
      },
      {
        ...base,
        id: '3',
        label: 'Plot 103 · -4 fruit',
        state: 'refused',
        message: 'Fruit count cannot be negative.',
      },
    ];
    render(
      <OutboxPanel
        items={items}
        online={false}
        accountId="acct-wren"
        onRetry={() => {}}
        onDiscard={() => {}}
      />,
    );
    expect(screen.getByTestId('outbox-summary').textContent).toBe(
      'Offline: entries are kept here and sent when the signal returns · 1 waiting · 0 sending · 1 saved · 1 refused',
    );
    expect(screen.getByText('Fruit count cannot be negative.')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Dismiss' })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Send now' }).hasAttribute('disabled')).toBe(false);
  });

  it('says how many entries wait for another grower on this phone', () => {
    const item = (id: string): OutboxItem => ({
      id,
      trialSlug: 'b',
      kind: 'harvest',
      method: 'POST',
      url: '',
      body: {},
      label: `Plot 10${id}`,
      accountId: 'acct-wren',
      accountName: 'Wren Alderby',
      state: 'waiting',
      message: null,
      attempts: 1,
      nextTryAt: 0,
      createdAt: 0,
      savedAt: null,
    });
    render(
      <OutboxPanel
        items={[item('1'), item('2')]}
        online
        accountId="acct-hollis"
        onRetry={() => {}}
        onDiscard={() => {}}
      />,
    );
    expect(
      screen.getByText(
        '2 entries wait for Wren Alderby to sign in again on this device; they are never sent under another account.',
      ),
    ).toBeTruthy();
  });
});

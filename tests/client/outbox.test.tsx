/**
 * The field log's outbox in a browser-like page (jsdom with an in-memory IndexedDB): entries
 * are kept first and sent after; a lost connection leaves them waiting; the server's refusal
 * is shown with its message; a retried entry carries the same id.
 */
import { render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import { backoffMs, Outbox, type OutboxItem } from '../../src/features/field-log/api/outbox';
import { OutboxPanel } from '../../src/features/field-log/components/outbox-panel';

let n = 0;
const opened: Outbox[] = [];
function outboxWith(replies: (() => Response | Promise<Response>)[]) {
  const sent: { url: string; body: { id: string } }[] = [];
  const send = (async (url: string, init?: RequestInit) => {
    sent.push({ url, body: JSON.parse(String(init?.body)) });
    const reply = replies.shift();
    if (!reply) throw new Error('no reply left');
    return reply();
  }) as typeof fetch;
  const box = new Outbox(send, `outbox-test-${++n}`);
  opened.push(box);
  return { box, sent };
}
afterEach(() => {
  for (const b of opened.splice(0)) b.close();
});

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
    await box.add([entry('a')]);
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
    await box.add([entry('b')]);
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
    await box.add([entry('c')]);
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
    for (const id of ['r1', 'r2', 'r3', 'r4', 'r5']) await box.add([entry(id)]);
    await box.flush();
    await box.flush();
    expect(sent.map((s) => s.body.id)).toEqual(['r1', 'r2', 'r3', 'r4', 'r5']);
    expect(Object.values(await states(box))).toEqual(['saved', 'saved', 'saved', 'saved', 'saved']);
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
    render(<OutboxPanel items={items} online={false} onRetry={() => {}} onDiscard={() => {}} />);
    expect(screen.getByTestId('outbox-summary').textContent).toBe(
      'Offline: entries are kept here and sent when the signal returns · 1 waiting · 0 sending · 1 saved · 1 refused',
    );
    expect(screen.getByText('Fruit count cannot be negative.')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Dismiss' })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Send now' }).hasAttribute('disabled')).toBe(false);
  });
});

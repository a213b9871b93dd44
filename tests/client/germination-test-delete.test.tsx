/**
 * Deleting a germination test by keyboard: the Delete button keeps the focus while the delete is
 * on its way (the table is not redrawn under it), and once the row is gone the focus moves on to
 * the next row's Delete, the previous row's after the last row, or the lot's "Germination tests"
 * heading when no test is left, never back to the top of the page (WCAG 2.2 success criterion
 * 2.4.3 Focus Order: focus moves in an order that keeps meaning and operability).
 */
import type { GerminationTest } from '@common/contracts/seed';
import { act, fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse } from '../support/record-log-fixture';
import { brookRunnerSeed } from '../support/variety-fixtures';
import { renderBrookRunnerSeedPage } from '../support/variety-seed-page';

const test = (n: number, testedOn: string, germinated: number): GerminationTest => ({
  id: `00000000-0000-4000-8000-00000000000${n}`,
  testedOn,
  seedsTested: 100,
  seedsGerminated: germinated,
  days: 10,
  notes: '',
  // Display only here: the figures are germinated ÷ tested; the interval is not under test.
  percent: germinated,
  lowerPercent: germinated - 5,
  upperPercent: Math.min(100, germinated + 5),
});
const tests = [test(1, '2026-11-20', 91), test(2, '2026-11-02', 9), test(3, '2026-10-15', 88)];

afterEach(() => vi.unstubAllGlobals());

/** The page against a server holding `held` tests; each DELETE waits until `answer()` is called. */
function openPage(held: GerminationTest[]) {
  let left = held;
  let answer: () => void = () => {};
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      if (init?.method === 'DELETE') {
        await new Promise<void>((resolve) => (answer = resolve));
        left = left.filter((t) => !url.endsWith(`/tests/${t.id}`));
        return new Response(null, { status: 204 });
      }
      return jsonResponse(200, brookRunnerSeed(left));
    }),
  );
  vi.stubGlobal('confirm', () => true);
  renderBrookRunnerSeedPage();
  return { answer: () => act(() => answer()) };
}

const deleteButton = (testedOn: string) =>
  screen.findByRole('button', { name: `Delete the test read on ${testedOn}` });

/** Presses Delete on the focused button and checks the focus stays on it while it waits. */
async function pressDelete(testedOn: string, server: { answer: () => void }) {
  const button = await deleteButton(testedOn);
  button.focus();
  fireEvent.click(button);
  // The delete is on its way (the server holds its answer).
  await waitFor(() =>
    expect(fetch).toHaveBeenCalledWith(
      expect.stringContaining('/tests/'),
      expect.objectContaining({ method: 'DELETE' }),
    ),
  );
  expect(document.activeElement).toBe(button);
  expect(button.isConnected).toBe(true);
  server.answer();
  await waitFor(() => expect(button.isConnected).toBe(false));
}

describe('deleting a germination test by keyboard', () => {
  it('keeps the focus on Delete while it waits, then moves it to the next row’s Delete', async () => {
    const server = openPage(tests);
    await pressDelete('2026-11-02', server);
    const next = await deleteButton('2026-10-15');
    await waitFor(() => expect(document.activeElement).toBe(next));
  });

  it('after the last row, to the row before it', async () => {
    const server = openPage(tests);
    await pressDelete('2026-10-15', server);
    const before = await deleteButton('2026-11-02');
    await waitFor(() => expect(document.activeElement).toBe(before));
  });

  it('with no test left, to the lot’s “Germination tests” heading', async () => {
    const server = openPage([tests[1]!]);
    await pressDelete('2026-11-02', server);
    await screen.findByText('None yet.');
    const heading = screen.getByRole('heading', { level: 4, name: 'Germination tests' });
    await waitFor(() => expect(document.activeElement).toBe(heading));
  });
});

/**
 * Closing a seed offer: a refusal from the server is shown beside the button (the coordinator
 * knows the offer is still open), and a close that went through refreshes the page, which then
 * offers to start a new offer. The product's own behaviour; no outside source applies.
 */
import type { VarietySeed } from '@common/contracts/seed';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse } from '../support/record-log-fixture';
import { brookRunnerSeed, fixtureLotId } from '../support/variety-fixtures';
import { renderBrookRunnerSeedPage } from '../support/variety-seed-page';

const offerId = '00000000-0000-4000-8000-0000000000f1';

const seedWith = (status: 'open' | 'closed'): VarietySeed =>
  brookRunnerSeed(
    [],
    [
      {
        id: offerId,
        lotId: fixtureLotId,
        lotLabel: 'BR-26',
        packetsOffered: 12,
        packetsLeft: 7,
        note: '',
        status,
        createdAt: '2026-11-20T10:00:00.000Z',
      },
    ],
    true,
  );

afterEach(() => vi.unstubAllGlobals());

/** The page against a server whose PATCH answers with `patch`. */
function openPage(patch: () => Response) {
  let status: 'open' | 'closed' = 'open';
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init?: RequestInit) => {
      if (init?.method === 'PATCH') {
        const answer = patch();
        if (answer.ok) status = 'closed';
        return answer;
      }
      if (url.endsWith('/requests')) return jsonResponse(200, { requests: [] });
      return jsonResponse(200, seedWith(status));
    }),
  );
  renderBrookRunnerSeedPage();
}

describe('closing a seed offer', () => {
  it('shows the server’s refusal and leaves the offer open', async () => {
    openPage(() =>
      jsonResponse(403, {
        error: { code: 'forbidden', message: 'Only the group’s coordinators may do that.' },
      }),
    );
    const close = await screen.findByRole('button', { name: 'Close the offer' });
    fireEvent.click(close);
    expect(await screen.findByText('Only the group’s coordinators may do that.')).toBeTruthy();
    expect(screen.getByText(/7 of 12 packets left/)).toBeTruthy();
    await waitFor(() =>
      expect(
        (screen.getByRole('button', { name: 'Close the offer' }) as HTMLButtonElement).disabled,
      ).toBe(false),
    );
  });

  it('once closed, the page is read again and no longer shows the open offer', async () => {
    openPage(() => new Response(null, { status: 204 }));
    fireEvent.click(await screen.findByRole('button', { name: 'Close the offer' }));
    await waitFor(() => expect(screen.queryByText(/7 of 12 packets left/)).toBeNull());
    expect(screen.queryByRole('button', { name: 'Close the offer' })).toBeNull();
  });
});

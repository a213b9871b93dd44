/**
 * A seed write (a lot added or changed, a germination test, an offer, a request) awaits one
 * invalidation that reaches, besides the seed pages, every trial's lot choices for its entries and
 * the open offers its sheet links to: a trial's page open beside the seed page shows the new lot
 * label once the write's handler goes on. Setting the lot an entry was sown from is such a write
 * too (the variety's seed page lists the lot's sowings).
 */
import { QueryClient, QueryClientProvider, type QueryKey, useQuery } from '@tanstack/react-query';
import { render, renderHook, screen } from '@testing-library/react';
import type { ReactNode } from 'react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { entryLotsQueryOptions, useSetEntryLot } from '../../src/features/design/api/entry-lots';
import { trialOffersQueryOptions } from '../../src/features/results/api/get-trial-offers';
import {
  useSeedChanged,
  varietySeedQueryOptions,
} from '../../src/features/seed/api/get-variety-seed';
import { offerQueryOptions } from '../../src/features/seed/api/get-offer';
import { trialKeys } from '../../src/lib/trial-keys';

const trials = ['larkmead-beans', 'sallowby-squash'];

/** A query client holding one answer per key; each later answer names the lot's new label. */
function seeded(keys: QueryKey[]) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: 30_000 } },
  });
  const asked = new Map<string, number>();
  for (const key of keys) {
    // Counted by the key asked for: the design's defaults also match its entry lots' key.
    client.setQueryDefaults(key, {
      queryFn: ({ queryKey }) => {
        const hash = JSON.stringify(queryKey);
        asked.set(hash, (asked.get(hash) ?? 0) + 1);
        return { lot: 'Brook 2026 (resorted)' };
      },
    });
    client.setQueryData(key, { lot: 'Brook 2026' });
  }
  return { client, asked: (key: QueryKey) => asked.get(JSON.stringify(key)) ?? 0 };
}

function LotChoice({ queryKey }: { queryKey: QueryKey }) {
  const { data } = useQuery<{ lot: string }>({ queryKey });
  return <p>{data ? `lot ${data.lot}` : 'nothing yet'}</p>;
}

afterEach(() => vi.unstubAllGlobals());

type Wrapper = ({ children }: { children: ReactNode }) => ReactNode;
const [open, other] = trials as [string, string];
const entryId = '8b1e4c2a-7d3f-4e59-a1c6-0f2d9e7b3a54';

/** Each write as its screen runs it: the hook, called once, awaited. */
const writes: [string, (wrapper: Wrapper) => Promise<void>][] = [
  [
    'on the seed pages',
    (wrapper) => renderHook(() => useSeedChanged(), { wrapper }).result.current(),
  ],
  [
    'of the lot an entry was sown from',
    async (wrapper) => {
      const fetch = vi.fn(async () => new Response(null, { status: 204 }));
      vi.stubGlobal('fetch', fetch);
      const { result } = renderHook(() => useSetEntryLot(open), { wrapper });
      await result.current(entryId, { lotId: null });
      expect(fetch).toHaveBeenCalledTimes(1);
      expect(fetch.mock.calls[0]).toMatchObject([
        `/api/trials/${open}/entry-lots/${entryId}`,
        { method: 'PUT' },
      ]);
    },
  ],
];

describe('a seed write', () => {
  it.each(writes)(
    '%s refetches an open trial’s entry lots before it resolves, and marks every trial’s lots and sheet offers out of date',
    async (_, write) => {
      const seedKeys = [
        ...trials.flatMap((t) => [
          entryLotsQueryOptions(t).queryKey,
          trialOffersQueryOptions(t).queryKey,
        ]),
        varietySeedQueryOptions('brook-runner').queryKey,
        offerQueryOptions('5d7c9a51-3f0e-4a66-9d4e-2c1b0f6e8a71').queryKey,
      ];
      // What a seed write does not change: the trials' designs (kept for the field log offline),
      // plots and the published sheet itself.
      const untouched = trials.flatMap((t) => [
        trialKeys.design(t),
        trialKeys.plots(t),
        trialKeys.publishedSheet(t, 'latest'),
      ]);
      const { client, asked } = seeded([...seedKeys, ...untouched]);
      const wrapper = ({ children }: { children: ReactNode }) => (
        <QueryClientProvider client={client}>{children}</QueryClientProvider>
      );
      const openLots = entryLotsQueryOptions(open).queryKey;
      render(<LotChoice queryKey={openLots} />, { wrapper });
      await screen.findByText('lot Brook 2026');

      await write(wrapper);
      // Awaited: the picker on screen already has the new label when the write's handler goes on.
      expect(asked(openLots)).toBe(1);
      await screen.findByText('lot Brook 2026 (resorted)');

      for (const key of seedKeys)
        expect({ key, invalidated: client.getQueryState(key)!.isInvalidated }).toEqual({
          key,
          invalidated: JSON.stringify(key) !== JSON.stringify(openLots),
        });
      expect(client.getQueryState(entryLotsQueryOptions(other).queryKey)!.isInvalidated).toBe(true);
      for (const key of untouched)
        expect({ key, invalidated: client.getQueryState(key)!.isInvalidated }).toEqual({
          key,
          invalidated: false,
        });
    },
  );
});

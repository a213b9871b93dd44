/**
 * A variety's figures season by season, sorted by rank or mean: a trait with no rank (no better
 * direction) or no mean stays below the ranked ones whichever way the column is sorted, so
 * pressing the header twice never puts "not ranked" rows on top. The product's own rule; no
 * outside source applies.
 */
import type { VarietyRecord, VarietyTrait } from '@common/contracts/varieties';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, within } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { Component as VarietyPage } from '../../src/features/varieties/routes/variety-route';
import { sessionKeys } from '../../src/lib/session';
import { trialKeys } from '../../src/lib/trial-keys';
import { brookRunner } from '../support/variety-fixtures';

const trait = (
  key: string,
  label: string,
  mean: number | null,
  rank: number | null,
): VarietyTrait => ({
  key,
  label,
  unit: 'g',
  direction: rank === null ? 'none' : 'higher',
  decimals: 0,
  mean,
  rank,
  entryCount: 8,
  group: '',
  sites: [],
});

const record: VarietyRecord = {
  variety: brookRunner(),
  canEdit: false,
  trials: [
    {
      slug: 'fenwold-beans-2026',
      title: 'Fenwold beans 2026',
      season: '2026',
      view: 'trial',
      version: null,
      entry: { name: 'Brook Runner', code: 'BR', notes: '' },
      sites: [],
      traits: [
        trait('pod-colour', 'Pod colour score', 3, null),
        trait('yield', 'Marketable yield', 1840, 2),
        trait('first-pick', 'First picking mass', null, null),
        trait('pod-mass', 'Pod mass', 12, 5),
      ],
      warnings: [],
    },
  ],
  photos: [],
};

beforeEach(() =>
  vi.stubGlobal(
    'fetch',
    vi.fn(() => new Promise<Response>(() => {})),
  ),
);
afterEach(() => vi.unstubAllGlobals());

function show() {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity } },
  });
  client.setQueryData(sessionKeys.me, null);
  client.setQueryData(trialKeys.groups(), { groups: [] });
  client.setQueryData(trialKeys.variety('brook-runner'), record);
  render(
    <QueryClientProvider client={client}>
      <MemoryRouter initialEntries={['/varieties/brook-runner']}>
        <Routes>
          <Route path="/varieties/:variety" element={<VarietyPage />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

const labels = record.trials[0]!.traits.map((t) => t.label);

/** The trait column of the season-by-season table, top to bottom. */
async function traitOrder(): Promise<string[]> {
  const table = await screen.findByRole('table', { name: /figures season by season/ });
  return within(table)
    .getAllByRole('row')
    .slice(1)
    .map(
      (row) =>
        within(row)
          .queryAllByRole('cell')
          .map((c) => c.textContent ?? '')
          .find((t) => labels.includes(t)) ?? '',
    );
}

const press = (name: string) =>
  fireEvent.click(screen.getByRole('button', { name: new RegExp(`^${name}`) }));

describe('a variety’s figures sorted by rank or mean', () => {
  it('keeps unranked traits last, ascending and descending', async () => {
    show();
    await traitOrder();
    press('Rank');
    expect((await traitOrder()).slice(0, 2)).toEqual(['Marketable yield', 'Pod mass']);
    press('Rank');
    const descending = await traitOrder();
    expect(descending.slice(0, 2)).toEqual(['Pod mass', 'Marketable yield']);
    expect(descending.slice(2).sort()).toEqual(['First picking mass', 'Pod colour score']);
  });

  it('keeps a trait with no mean last, ascending and descending', async () => {
    show();
    await traitOrder();
    press('Mean');
    expect((await traitOrder()).at(-1)).toBe('First picking mass');
    press('Mean');
    expect((await traitOrder()).at(-1)).toBe('First picking mass');
  });
});

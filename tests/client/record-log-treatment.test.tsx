/**
 * A two-factor trial's record logs name each record's plot level of the treatment in a column
 * of its own after the entry, headed by the treatment's name as the lead wrote it; a one-factor
 * trial's logs have no such column. The levels are the fixture's own (the plots' layout).
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen, within } from '@testing-library/react';
import type { ComponentType } from 'react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { Component as HarvestLog } from '../../src/features/records/routes/harvest-log-route';
import { Component as ObservationLog } from '../../src/features/records/routes/observation-log-route';
import {
  brookfoldTrial,
  jsonResponse as json,
  recordRowBase,
  fixtureId as uuid,
} from '../support/record-log-fixture';

const factor = { name: 'Fertilizer', levels: ['none', 'pre-plant'], arrangement: 'split_plot' };
const traits = [
  {
    id: uuid(12),
    key: 'days_to_first_pods',
    label: 'Days to first pods',
    quantityKind: 'count',
    basis: 'plot',
    direction: 'lower',
    scaleMin: null,
    scaleMax: null,
    displayUnit: null,
    plausibleMin: null,
    plausibleMax: null,
  },
];
const record = (n: number, treatment: string) => ({
  ...recordRowBase,
  id: uuid(100 + n),
  plotNumber: 100 + n,
  treatment,
});
const harvests = [
  {
    ...record(2, 'pre-plant'),
    harvestedOn: '2026-07-02',
    fruitCount: 12,
    massG: 150,
    grade: 'marketable',
  },
  {
    ...record(1, 'none'),
    harvestedOn: '2026-07-01',
    fruitCount: 10,
    massG: 124,
    grade: 'marketable',
  },
];
const observations = [
  {
    ...record(2, 'pre-plant'),
    traitId: uuid(12),
    traitKey: 'days_to_first_pods',
    traitLabel: 'Days to first pods',
    observedOn: '2026-07-02',
    value: 58,
    valueDate: null,
    plantNumber: null,
  },
];

afterEach(() => vi.unstubAllGlobals());

function show(path: string, Page: ComponentType, trial: object) {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      if (url === '/api/me')
        return json(401, { error: { code: 'unauthenticated', message: 'Sign in.' } });
      if (url === '/api/trials/brookfold') return json(200, trial);
      if (url.startsWith('/api/trials/brookfold/harvests'))
        return json(200, { harvests, page: 1, limit: 50, total: 2, totalMassG: 274 });
      if (url.startsWith('/api/trials/brookfold/observations'))
        return json(200, { observations, page: 1, limit: 50, total: 1 });
      return json(404, { error: { code: 'not_found', message: url } });
    }),
  );
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  render(
    <QueryClientProvider client={queryClient}>
      <MemoryRouter initialEntries={[`/t/brookfold/records/${path}`]}>
        <Routes>
          <Route path={`/t/:slug/records/${path}`} element={<Page />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
}

/** The headers in order, and each body row's cells in the column headed `header`. */
async function column(header: string) {
  const table = await screen.findByRole('table');
  await within(table).findAllByText('Tallow Finger (E1)');
  const headers = within(table)
    .getAllByRole('columnheader')
    .map((h) => h.textContent);
  const at = headers.indexOf(header);
  const rows = within(table).getAllByRole('row').slice(1);
  return {
    headers,
    cells: rows.map((r) => (at < 0 ? null : within(r).getAllByRole('cell')[at]?.textContent)),
  };
}

describe('the record logs of a two-factor trial', () => {
  const twoFactor = brookfoldTrial({ traits, factor, harvestCount: 2, observationCount: 1 });

  it('harvest log: each record’s level under “Fertilizer”, right after the entry', async () => {
    show('harvests', HarvestLog, twoFactor);
    const { headers, cells } = await column('Fertilizer');
    expect(headers.indexOf('Fertilizer')).toBe(
      headers.findIndex((h) => h?.startsWith('Entry')) + 1,
    );
    // newest first, as the server answered
    expect(cells).toEqual(['pre-plant', 'none']);
  });

  it('observation log: the same column', async () => {
    show('observations', ObservationLog, twoFactor);
    const { headers, cells } = await column('Fertilizer');
    expect(headers.indexOf('Fertilizer')).toBe(
      headers.findIndex((h) => h?.startsWith('Entry')) + 1,
    );
    expect(cells).toEqual(['pre-plant']);
  });

  it('a one-factor trial’s log has no treatment column', async () => {
    show('harvests', HarvestLog, brookfoldTrial({ traits, harvestCount: 2 }));
    const { headers } = await column('Fertilizer');
    expect(headers).not.toContain('Fertilizer');
    expect(headers.some((h) => h?.startsWith('Entry'))).toBe(true);
  });
});

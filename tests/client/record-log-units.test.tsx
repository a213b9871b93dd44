/**
 * The record tables show each trait's values in one unit per column, chosen once for the whole
 * table (never 920 mm on one row and 1.01 m on the next), with the recorded precision, and
 * flag records outside their trait's plausible range in words, not colour alone. Unit factors
 * are exact (NIST Handbook 44, Appendix C: 1 kg = 1000 g, 1 cm = 10 mm); the ranges are the
 * presets' (common practice, no source).
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

const trait = { scaleMin: null, scaleMax: null, displayUnit: null };
const traits = [
  {
    ...trait,
    id: uuid(11),
    key: 'marketable_yield',
    label: 'Marketable yield',
    quantityKind: 'mass',
    basis: 'harvest',
    direction: 'higher',
    plausibleMin: 0.5,
    plausibleMax: 5000,
  },
  {
    ...trait,
    id: uuid(12),
    key: 'plant_height',
    label: 'Plant height',
    quantityKind: 'length',
    basis: 'plant',
    direction: 'lower',
    plausibleMin: 20,
    plausibleMax: 4000,
  },
];
const trial = brookfoldTrial({ traits, harvestCount: 3, observationCount: 3 });
const record = (n: number) => ({ ...recordRowBase, id: uuid(100 + n), plotNumber: 100 + n });
const harvest = (n: number, fruitCount: number, massG: number) => ({
  ...record(n),
  harvestedOn: `2026-07-0${n}`,
  fruitCount,
  massG,
  grade: 'marketable',
});
const height = (n: number, mm: number) => ({
  ...record(n),
  traitId: uuid(12),
  traitKey: 'plant_height',
  traitLabel: 'Plant height',
  observedOn: `2026-07-0${n}`,
  value: mm,
  valueDate: null,
  plantNumber: 1,
});

afterEach(() => vi.unstubAllGlobals());

function show(path: string, Page: ComponentType) {
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      if (url === '/api/me')
        return json(401, { error: { code: 'unauthenticated', message: 'Sign in.' } });
      if (url === '/api/trials/brookfold') return json(200, trial);
      if (url.startsWith('/api/trials/brookfold/harvests'))
        return json(200, {
          // 9,999 fruit weighing 2 kg: 0.2 g per fruit, both outside the plausible range.
          // The server answers newest first.
          harvests: [harvest(3, 9999, 2000), harvest(2, 12, 1500), harvest(1, 10, 1240)],
          page: 1,
          limit: 50,
          total: 3,
          totalMassG: 4740,
        });
      if (url.startsWith('/api/trials/brookfold/observations'))
        return json(200, {
          // 9,200 mm: a height typed in cm read as mm, then multiplied again.
          observations: [height(3, 9200), height(2, 1010), height(1, 920)],
          page: 1,
          limit: 50,
          total: 3,
        });
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

const cellsOf = async (column: number) => {
  const table = await screen.findByRole('table');
  await within(table).findAllByText('Tallow Finger (E1)');
  const rows = (await within(table).findAllByRole('row')).slice(1);
  return rows.map((r) => within(r).getAllByRole('cell')[column]!.textContent);
};

describe('the harvest log', () => {
  it('shows every mass in kg when the column’s typical harvest is over 1 kg, and flags the implausible one', async () => {
    show('harvests', HarvestLog);
    expect(await screen.findByRole('columnheader', { name: 'Mass (kg)' })).toBeTruthy();
    // newest first; grams recorded whole, so kg keep three decimals (the same 1 g step)
    expect(await cellsOf(5)).toEqual([
      expect.stringMatching(/^2\.000⚠ check: 9,999 fruit in one harvest is outside/),
      '1.500',
      '1.240',
    ]);
    const flag = screen.getByTitle(/0\.2 g per fruit is outside the plausible 0\.5–5,000 g/);
    expect(flag.textContent).toContain('check');
    expect(screen.getByText(/3 harvests · 4\.740 kg in total/)).toBeTruthy();
  });
});

describe('the observation log', () => {
  it('shows heights in cm on every row, and flags 920 cm on a lower-is-better trait', async () => {
    show('observations', ObservationLog);
    expect(await cellsOf(6)).toEqual([
      expect.stringMatching(
        /^920\.0⚠ check: Plant height 920 cm is outside the plausible 2–400 cm/,
      ),
      '101.0',
      '92.0',
    ]);
    expect(await cellsOf(4)).toEqual(Array(3).fill('Plant height (cm)'));
  });
});

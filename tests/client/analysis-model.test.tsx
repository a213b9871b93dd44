/**
 * The analysis page chooses the model from the trial's design and lets the lead switch where
 * both apply: several sites open on the mixed model (REML) with its variance components, a
 * completely randomized trial offers the classical analysis only. The numbers shown are the
 * engine's own on fixtures/analysis/multisite-missing.csv, the file the R reference checks use.
 */
import { readFileSync } from 'node:fs';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { AnalysisModel } from '../../common/contracts/analysis';
import { trialActions } from '../../common/policy';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import { Component as TrialAnalysis } from '../../src/features/analysis/routes/trial-analysis-route';

const csv = readFileSync('fixtures/analysis/multisite-missing.csv', 'utf8');
const uuid = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

function trial(design: 'crd' | 'rcbd' | 'multisite') {
  return {
    id: uuid(1),
    slug: 'wend-hollow-okra',
    title: 'Wend Hollow okra',
    crop: 'Okra',
    season: '2026',
    design,
    status: 'active',
    siteCount: 1,
    entryCount: 3,
    plotCount: 9,
    myRole: 'lead',
    description: '',
    sowingDate: null,
    transplantDate: null,
    sites: [],
    entries: [],
    traits: [
      {
        id: uuid(2),
        key: 'pod_yield',
        label: 'Pod yield',
        quantityKind: 'mass',
        basis: 'plot',
        direction: 'higher',
        scaleMin: null,
        scaleMax: null,
        displayUnit: null,
        plausibleMin: null,
        plausibleMax: null,
      },
    ],
    harvestCount: 0,
    observationCount: 0,
    mySiteIds: null,
    permissions: Object.fromEntries(trialActions.map((a) => [a, a === 'trial.read'])),
  };
}

/** The API's answer: the engine's result on the fixture, with the trait's own fields. */
function analysisAnswer(model: AnalysisModel, design: 'crd' | 'rcbd' | 'multisite') {
  const result = analyzeCsv(csv, { model, ...(design === 'crd' ? { design: 'crd' } : {}) });
  return JSON.parse(
    JSON.stringify({
      ...result,
      traitKey: 'pod_yield',
      traitLabel: 'Pod yield',
      quantityKind: 'mass',
      direction: 'higher',
      basis: 'plot',
      unit: 'g',
      decimals: { plotValue: 0, mean: 1 },
      valueNote: 'sum of the plot’s harvests',
      plotValues: [],
      entryCodes: {},
    }),
  );
}

const json = (body: unknown, status = 200) =>
  new Response(JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json' },
  });

afterEach(() => vi.unstubAllGlobals());

function renderPage(design: 'crd' | 'rcbd' | 'multisite') {
  const asked: URL[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: string) => {
      const url = new URL(input, 'http://127.0.0.1');
      if (url.pathname === '/api/trials/wend-hollow-okra') return json(trial(design));
      if (url.pathname.endsWith('/analysis')) {
        asked.push(url);
        return json(
          analysisAnswer((url.searchParams.get('model') ?? 'anova') as AnalysisModel, design),
        );
      }
      // The ranking, season and session panels are not what this test is about.
      return json({ error: { code: 'not_found', message: 'Not here.' } }, 404);
    }),
  );
  render(
    <QueryClientProvider
      client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}
    >
      <MemoryRouter initialEntries={['/t/wend-hollow-okra/analysis']}>
        <Routes>
          <Route path="/t/:slug/analysis" element={<TrialAnalysis />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
  return asked;
}

describe('choosing the model on the analysis page', () => {
  it('several sites: opens on the mixed model with its variance components, and switches to the classical analysis', async () => {
    const asked = renderPage('multisite');
    const model = await screen.findByRole('combobox', { name: /^Model/ });
    expect((model as HTMLSelectElement).value).toBe('mixed');
    const components = await screen.findByRole('table', { name: /Variance components/ });
    const expected = analyzeCsv(csv, { model: 'mixed' }).varianceComponents!;
    const shown = within(components)
      .getAllByRole('row')
      .slice(1)
      .map((r) => Number(r.querySelector('[data-variance]')!.getAttribute('data-variance')));
    expect(shown).toEqual(expected.map((c) => c.variance));
    expect(screen.getByRole('region', { name: 'Model used' }).textContent).toMatch(/Satterthwaite/);
    // Nothing was asked for before the design was known, so never under the wrong model.
    expect(asked.map((u) => u.searchParams.get('model'))).toEqual(['mixed']);

    fireEvent.change(model, { target: { value: 'anova' } });
    await waitFor(() =>
      expect(screen.queryByRole('table', { name: /Variance components/ })).toBeNull(),
    );
    expect(asked.at(-1)!.searchParams.get('model')).toBe('anova');
    expect(screen.getByRole('region', { name: 'Model used' }).textContent).toMatch(
      /Classical analysis of variance/,
    );
  });

  it('a completely randomized trial offers the classical analysis only', async () => {
    const asked = renderPage('crd');
    const model = await screen.findByRole('combobox', { name: /^Model/ });
    await screen.findByRole('region', { name: 'Model used' });
    expect((model as HTMLSelectElement).disabled).toBe(true);
    expect(
      within(model)
        .getAllByRole('option')
        .map((o) => o.textContent),
    ).toEqual(['Classical analysis of variance']);
    expect(asked.every((u) => u.searchParams.get('model') === 'anova')).toBe(true);
  });
});

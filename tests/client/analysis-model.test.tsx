/**
 * The analysis page chooses the model from the trial's design and lets the lead switch where
 * both apply: several sites open on the mixed model (REML) with its variance components, a
 * completely randomized trial offers the classical analysis only. The numbers shown are the
 * engine's own on fixtures/analysis/multisite-missing.csv, the file the R reference checks use.
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { AnalysisModel } from '../../common/contracts/analysis';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import { Component as TrialAnalysis } from '../../src/features/analysis/routes/trial-analysis-route';
import { analysisAnswer, analysisCsv as csv, okraTrial as trial } from '../support/analysis-page';
import { jsonResponse } from '../support/record-log-fixture';

afterEach(() => vi.unstubAllGlobals());

function renderPage(design: 'crd' | 'rcbd' | 'multisite') {
  const asked: URL[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: string) => {
      const url = new URL(input, 'http://127.0.0.1');
      if (url.pathname === '/api/trials/wend-hollow-okra') return jsonResponse(200, trial(design));
      if (url.pathname.endsWith('/analysis')) {
        asked.push(url);
        return jsonResponse(
          200,
          analysisAnswer((url.searchParams.get('model') ?? 'anova') as AnalysisModel, design),
        );
      }
      // The ranking, season and session panels are not what this test is about.
      return jsonResponse(404, { error: { code: 'not_found', message: 'Not here.' } });
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

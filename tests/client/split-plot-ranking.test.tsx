/**
 * The ranking across traits on a split plot's analysis page: with no model chosen, each trait's
 * means come from the model the analysis API chooses for that trait (the split-plot analysis, or
 * the mixed model for a trait that lost plots), so the ranking request names no model, whatever
 * model the trait shown above was answered with. A model the lead chooses applies to every trait.
 * The analysis shown is the engine's own mixed-model result on
 * fixtures/analysis/multisite-missing.csv (the file the R reference checks use).
 */
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import { MemoryRouter, Route, Routes } from 'react-router-dom';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { Component as TrialAnalysis } from '../../src/features/analysis/routes/trial-analysis-route';
import { analysisAnswer, massTrait, okraTrial } from '../support/analysis-page';
import { jsonResponse } from '../support/record-log-fixture';

const splitPlotTrial = okraTrial('rcbd', {
  title: 'Wend Hollow okra under two mulches',
  plotCount: 18,
  traits: [massTrait(2, 'pod_yield', 'Pod yield'), massTrait(3, 'pod_count', 'Pod count')],
  factor: { name: 'Mulch', levels: ['straw', 'bare'], arrangement: 'split_plot' },
});

/** The shown trait lost plots: the API answered it with the mixed model. */
const mixedAnswer = analysisAnswer('mixed', 'multisite');

afterEach(() => vi.unstubAllGlobals());

/** The page at `address`; returns the ranking requests and the analysis requests it made. */
function renderPage(address: string) {
  const ranking: URL[] = [];
  const analysis: URL[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (input: string) => {
      const url = new URL(input, 'http://127.0.0.1');
      if (url.pathname === '/api/trials/wend-hollow-okra') return jsonResponse(200, splitPlotTrial);
      if (url.pathname.endsWith('/analysis')) {
        analysis.push(url);
        return jsonResponse(200, mixedAnswer);
      }
      if (url.pathname.endsWith('/ranking')) ranking.push(url);
      // The ranking's figures, the season and the session are not what this test is about.
      return jsonResponse(404, { error: { code: 'not_found', message: 'Not here.' } });
    }),
  );
  render(
    <QueryClientProvider
      client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}
    >
      <MemoryRouter initialEntries={[address]}>
        <Routes>
          <Route path="/t/:slug/analysis" element={<TrialAnalysis />} />
        </Routes>
      </MemoryRouter>
    </QueryClientProvider>,
  );
  return { ranking, analysis };
}

describe('the ranking panel of a split plot', () => {
  it('with no model chosen, leaves each trait’s model to the API, not the shown trait’s', async () => {
    const asked = renderPage('/t/wend-hollow-okra/analysis');
    await screen.findByRole('heading', { name: 'Ranking across traits' });
    await waitFor(() => expect(asked.analysis.length).toBeGreaterThan(0));
    // The shown trait came back under the mixed model…
    await screen.findByRole('table', { name: /Variance components/ });
    await waitFor(() => expect(asked.ranking.length).toBeGreaterThan(0));
    // …and no ranking request, before or after it, named a model.
    expect(asked.ranking.map((u) => u.searchParams.get('model'))).toEqual(
      asked.ranking.map(() => null),
    );
    expect(asked.ranking.at(-1)!.searchParams.get('traits')).toBe('pod_yield,pod_count');
  });

  it('a model the lead chose applies to every trait', async () => {
    const asked = renderPage('/t/wend-hollow-okra/analysis?model=anova');
    await screen.findByRole('heading', { name: 'Ranking across traits' });
    await waitFor(() => expect(asked.ranking.length).toBeGreaterThan(0));
    expect(new Set(asked.ranking.map((u) => u.searchParams.get('model')))).toEqual(
      new Set(['anova']),
    );
  });
});

/**
 * The analysis page's two-factor tables: the ANOVA lines keep the strata's order and name the
 * treatment as the lead named it ("Fertilizer"), with plain "Block" at one site; the cell means
 * (each variety × level, the variety means and the level means) and the simple effects carry the
 * reader's unit in their headers. The numbers are R's: fixtures/analysis/two-factor-split-plot.json
 * (aov with Error(block/treatment) + emmeans 1.8.4.1, the call stored beside them).
 */
import { readFileSync } from 'node:fs';
import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import {
  type AnalysisResult,
  type TrialAnalysis,
  twoFactorSchema,
} from '../../common/contracts/analysis';
import { formatNumber } from '../../common/display-units';
import { AnovaTable } from '../../src/features/analysis/components/analysis-tables';
import { TwoFactorPanel } from '../../src/features/analysis/components/two-factor-panel';

type Mean = { mean: number; se: number };
const r = JSON.parse(readFileSync('fixtures/analysis/two-factor-split-plot.json', 'utf8')) as {
  anova: AnalysisResult['anova'];
  cellMeans: (Mean & { variety: string; treatment: string; df: number })[];
  treatmentMeans: (Mean & { treatment: string; df: number })[];
  varietyMeans: (Mean & { variety: string; df: number })[];
  treatmentWithinVariety: {
    within: string;
    a: string;
    b: string;
    difference: number;
    se: number;
    df: number;
    t: number;
    p: number;
  }[];
};
const twoFactor = twoFactorSchema.parse({
  factor: 'Fertilizer',
  levels: ['none', 'pre-plant'],
  layout: 'split-plot',
  cellMeans: r.cellMeans,
  treatmentMeans: r.treatmentMeans,
  varietyMeans: r.varietyMeans,
  treatmentWithinVariety: r.treatmentWithinVariety,
  varietyWithinTreatment: [],
});
// Only the fields these tables read; the rest of an analysis does not bear on them.
const result = (sites: number) =>
  ({
    design: sites > 1 ? 'multisite' : 'rcbd',
    model: 'anova',
    alpha: 0.05,
    traitLabel: 'Days to first pods',
    anova: r.anova,
    counts: { entries: 4, sites, blocks: 4, rows: 32, missingPlots: 0 },
    twoFactor,
  }) as unknown as TrialAnalysis;
const days = { label: 'd', factor: 1 };
const pm = (m: Mean) => `${formatNumber(m.mean)} ± ${formatNumber(m.se, 3)}`;
const texts = (els: HTMLElement[]) => els.map((e) => e.textContent);

describe('the two-factor tables', () => {
  it('name the strata after the trial’s factor, in the order aov gives them, with plain blocks at one site', () => {
    render(
      <AnovaTable result={result(1)} unit={days} title="Days to first pods" factor="Fertilizer" />,
    );
    const anova = screen.getByRole('table', { name: /Analysis of variance: Days to first pods/ });
    expect(texts(within(anova).getAllByRole('rowheader'))).toEqual([
      'Block',
      'Fertilizer',
      'Block × fertilizer (main-plot error)',
      'Variety',
      'Variety × fertilizer',
      'Residual',
    ]);
    // The order is the content: no header sorts.
    expect(within(anova).queryAllByRole('button')).toEqual([]);
    const fertilizer = within(anova).getByRole('row', { name: /^Fertilizer/ });
    const f = r.anova.find((l) => l.source === 'treatment')!.f!;
    expect(
      within(fertilizer)
        .getAllByRole('cell')
        .map((c) => c.textContent),
    ).toContain('Block × fertilizer (main-plot error)');
    expect(Number(fertilizer.querySelector('[data-f]')!.getAttribute('data-f'))).toBeCloseTo(f, 10);
  });

  it('say "Block (within site)" when there are several sites', () => {
    render(<AnovaTable result={result(3)} unit={days} title="Days to first pods" />);
    const anova = screen.getByRole('table', { name: /Analysis of variance/ });
    expect(texts(within(anova).getAllByRole('rowheader')).slice(0, 2)).toEqual([
      'Block (within site)',
      'Treatment',
    ]);
  });

  it('show the cell, variety and fertilizer means and the simple effects with the unit in each header', () => {
    render(<TwoFactorPanel result={result(1)} unit={days} size={{ width: 400, height: 300 }} />);
    const cells = screen.getByRole('table', { name: /Cell means: variety × fertilizer/ });
    expect(texts(within(cells).getAllByRole('columnheader'))).toEqual([
      'Variety',
      'none (d)',
      'pre-plant (d)',
      'Variety mean (d)',
    ]);
    const varieties = [...new Set(r.cellMeans.map((c) => c.variety))];
    expect(texts(within(cells).getAllByRole('rowheader'))).toEqual([
      ...varieties,
      'Fertilizer mean',
    ]);
    for (const variety of varieties) {
      const row = within(cells).getByRole('row', { name: new RegExp(`^${variety}`) });
      expect(texts(within(row).getAllByRole('cell'))).toEqual([
        pm(r.cellMeans.find((c) => c.variety === variety && c.treatment === 'none')!),
        pm(r.cellMeans.find((c) => c.variety === variety && c.treatment === 'pre-plant')!),
        pm(r.varietyMeans.find((m) => m.variety === variety)!),
      ]);
    }
    const margin = within(cells).getByRole('row', { name: /^Fertilizer mean/ });
    expect(texts(within(margin).getAllByRole('cell'))).toEqual([
      pm(r.treatmentMeans[0]!),
      pm(r.treatmentMeans[1]!),
      '',
    ]);

    const effects = screen.getByRole('table', { name: /Fertilizer within each variety/ });
    expect(
      texts(within(effects).getAllByRole('columnheader')).map((h) => h?.replace(/[↕▲▼]/g, '')),
    ).toEqual(['Variety', 'Comparison', 'Difference (d)', 'SE (d)', 'df', 'p']);
    expect(texts(within(effects).getAllByRole('rowheader'))).toEqual(
      r.treatmentWithinVariety.map((e) => e.within),
    );
    const first = r.treatmentWithinVariety[0]!;
    const row = within(effects).getByRole('row', { name: new RegExp(`^${first.within}`) });
    expect(texts(within(row).getAllByRole('cell')).slice(0, 4)).toEqual([
      'none − pre-plant',
      formatNumber(first.difference),
      formatNumber(first.se, 3),
      first.df.toFixed(1),
    ]);
  });

  it('convert the means into the reader’s unit', () => {
    // A yield trait shown in pounds: the stored kilograms times 2.20462.
    render(
      <TwoFactorPanel
        result={result(1)}
        unit={{ label: 'lb', factor: 2.20462 }}
        size={{ width: 400, height: 300 }}
      />,
    );
    const cells = screen.getByRole('table', { name: /Cell means/ });
    expect(texts(within(cells).getAllByRole('columnheader'))[1]).toBe('none (lb)');
    const m = r.treatmentMeans[0]!;
    const margin = within(cells).getByRole('row', { name: /^Fertilizer mean/ });
    expect(within(margin).getAllByRole('cell')[0]!.textContent).toBe(
      `${formatNumber(m.mean * 2.20462)} ± ${formatNumber(m.se * 2.20462, 3)}`,
    );
  });
});

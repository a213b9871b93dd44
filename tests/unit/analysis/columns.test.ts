// analyzeCsv with chosen columns: the same numbers as the usual header names (fixture data).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError, analyzeCsv } from '../../../server/analysis/engine/analyze.js';

const csv = readFileSync('fixtures/analysis/npk-rcbd.csv', 'utf8');

describe('chosen columns', () => {
  it('renamed headers give the same analysis as the usual names', () => {
    const renamed = csv.replace(/^block,variety,value/, 'Rep,Treatment,Yield');
    const a = analyzeCsv(renamed, {
      columns: { block: 'rep', variety: 'Treatment' },
      trait: 'Yield',
    });
    const b = analyzeCsv(csv);
    expect(a.anova).toEqual(b.anova);
    expect(a.means.map((m) => m.mean)).toEqual(b.means.map((m) => m.mean));
  });

  it('an empty name leaves a layout column out (here: no blocks, so a completely randomized analysis)', () => {
    const r = analyzeCsv(csv, { columns: { block: '' }, trait: 'value' });
    expect(r.design).toBe('crd');
    expect(r.anova.map((l) => l.source)).toEqual(['variety', 'residual', 'total']);
  });

  it('a chosen column that is not in the header is named in the error', () => {
    expect(() => analyzeCsv(csv, { columns: { site: 'Garden' } })).toThrow(
      new AnalysisInputError('column "Garden": not found in the header (chosen as site)'),
    );
  });
});

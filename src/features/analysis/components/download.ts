import type { AnalysisResult } from '@common/contracts/analysis';
import { writeCsvSections } from '@common/csv';
import { saveText } from '@/lib/save-text';

export function downloadJson(name: string, result: unknown) {
  saveText(`${name}.json`, 'application/json', JSON.stringify(result, null, 2));
}

/** The model, the ANOVA and the means as one CSV (three sections), values in the analysis units. */
export function downloadCsv(name: string, result: AnalysisResult) {
  const adjusted = new Map(result.adjustedMeans.map((a) => [a.variety, a]));
  const text = writeCsvSections([
    {
      header: ['model', 'method'],
      rows: [[result.model, result.method]],
    },
    {
      header: ['source', 'df', 'ss', 'ms', 'f', 'p'],
      rows: result.anova.map((l) => [l.source, l.df, l.ss, l.ms, l.f, l.p]),
    },
    {
      header: [
        'rank',
        'variety',
        'n',
        'mean',
        'sd',
        'se',
        'adjusted_mean',
        'adjusted_se',
        'letters_hsd',
        'letters_lsd',
      ],
      rows: result.means.map((m) => [
        m.rank,
        m.variety,
        m.n,
        m.mean,
        m.sd,
        m.se,
        adjusted.get(m.variety)?.mean ?? null,
        adjusted.get(m.variety)?.se ?? null,
        m.groupHsd,
        m.groupLsd,
      ]),
    },
  ]);
  saveText(`${name}.csv`, 'text/csv', text);
}

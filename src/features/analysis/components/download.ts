import type { AnalysisResult } from '@common/contracts/analysis';
import { writeCsvSections } from '@common/csv';
import { saveText } from '@/lib/save-text';

export function downloadJson(name: string, result: unknown) {
  saveText(`${name}.json`, 'application/json', JSON.stringify(result, null, 2));
}

/** The ANOVA and the means as one CSV (two sections), values in the analysis units. */
export function downloadCsv(name: string, result: AnalysisResult) {
  const text = writeCsvSections([
    {
      header: ['source', 'df', 'ss', 'ms', 'f', 'p'],
      rows: result.anova.map((l) => [l.source, l.df, l.ss, l.ms, l.f, l.p]),
    },
    {
      header: ['rank', 'variety', 'n', 'mean', 'sd', 'se', 'letters_hsd', 'letters_lsd'],
      rows: result.means.map((m) => [
        m.rank,
        m.variety,
        m.n,
        m.mean,
        m.sd,
        m.se,
        m.groupHsd,
        m.groupLsd,
      ]),
    },
  ]);
  saveText(`${name}.csv`, 'text/csv', text);
}

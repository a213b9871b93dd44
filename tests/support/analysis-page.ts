/**
 * What the analysis page's client tests answer for: an okra trial (one trait, higher is better)
 * and the engine's own result on fixtures/analysis/multisite-missing.csv (the file the R reference
 * checks use), dressed with the trait's fields as the analysis API answers.
 */
import { readFileSync } from 'node:fs';
import type { AnalysisModel } from '../../common/contracts/analysis';
import { trialActions } from '../../common/policy';
import { analyzeCsv } from '../../server/analysis/engine/analyze';
import { fixtureId as uuid } from './record-log-fixture';

export const analysisCsv = readFileSync('fixtures/analysis/multisite-missing.csv', 'utf8');

/** A trait by mass per plot, higher is better. */
export const massTrait = (n: number, key: string, label: string) => ({
  id: uuid(n),
  key,
  label,
  quantityKind: 'mass',
  basis: 'plot',
  direction: 'higher',
  scaleMin: null,
  scaleMax: null,
  displayUnit: null,
  plausibleMin: null,
  plausibleMax: null,
});

/** The trial as GET /api/trials/:slug answers a reader. */
export function okraTrial(design: 'crd' | 'rcbd' | 'multisite', more: object = {}) {
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
    traits: [massTrait(2, 'pod_yield', 'Pod yield')],
    harvestCount: 0,
    observationCount: 0,
    mySiteIds: null,
    permissions: Object.fromEntries(trialActions.map((a) => [a, a === 'trial.read'])),
    ...more,
  };
}

/** The analysis API's answer: the engine's result on the fixture, with the trait's own fields. */
export function analysisAnswer(model: AnalysisModel, design: 'crd' | 'rcbd' | 'multisite') {
  const result = analyzeCsv(analysisCsv, {
    model,
    ...(design === 'crd' ? { design: 'crd' } : {}),
  });
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

/**
 * Stability of varieties across environments (each environment is one trial × site).
 *
 * Works on variety means per environment, on the largest balanced subset it can find, and gives
 * per variety:
 * - the regression on the environment index (Finlay and Wilkinson 1963): slope, its standard
 *   error, R², and a t test of slope = 1 (a slope below 1 means the variety changes less than the
 *   average variety from poor to good environments);
 * - the deviation mean square from that regression (Eberhart and Russell 1966), and, when the
 *   pooled error of a mean is known, s²d = deviation mean square − pooled error;
 * - Wricke's ecovalence (1962): the variety's share of the variety × environment sum of squares.
 *
 * The figures equal R's `lm()` on the same subset (fixtures/analysis/r/stability.R).
 */
import { studentTTwoSided } from './distributions.js';

export interface EnvironmentMean {
  variety: string;
  environment: string;
  mean: number;
}

export interface StabilityOptions {
  /** The pooled error variance of one variety mean (error mean square ÷ replicates), if known. */
  pooledErrorOfMean?: number;
  /** Fewest environments a variety needs (the regression needs at least 3). */
  minimumEnvironments?: number;
}

export interface Exclusion {
  name: string;
  reason: string;
}

export interface VarietyStability {
  variety: string;
  mean: number;
  slope: number;
  slopeSe: number;
  rSquared: number;
  slopeVersusOneT: number;
  slopeVersusOneP: number;
  deviationMs: number;
  deviationDf: number;
  /** Deviation mean square − pooled error of a mean; null without the pooled error. */
  deviationVariance: number | null;
  ecovalence: number;
  /** Ecovalence as a share of the variety × environment sum of squares (0–1). */
  ecovalenceShare: number;
}

export interface StabilityResult {
  usedVarieties: string[];
  usedEnvironments: string[];
  excludedVarieties: Exclusion[];
  excludedEnvironments: Exclusion[];
  grandMean: number;
  environments: { environment: string; mean: number; index: number }[];
  varieties: VarietyStability[];
}

export class StabilityInputError extends Error {}

const MIN_ENVIRONMENTS = 3;

/**
 * The balanced subset: varieties grown in too few environments go first; then, while any cell is
 * empty, the variety or environment with the largest share of empty cells goes (ties: the one
 * whose removal loses fewer grown cells, then the later one in input order).
 */
export function balancedSubset(
  cells: EnvironmentMean[],
  minimumEnvironments = MIN_ENVIRONMENTS,
): {
  varieties: string[];
  environments: string[];
  excludedVarieties: Exclusion[];
  excludedEnvironments: Exclusion[];
} {
  const varieties = [...new Set(cells.map((c) => c.variety))];
  const environments = [...new Set(cells.map((c) => c.environment))];
  const grown = new Set(cells.map((c) => key(c.variety, c.environment)));
  const excludedVarieties: Exclusion[] = [];
  const excludedEnvironments: Exclusion[] = [];

  let vs = varieties.filter((v) => {
    const n = environments.filter((e) => grown.has(key(v, e))).length;
    if (n >= minimumEnvironments) return true;
    excludedVarieties.push({
      name: v,
      reason: `grown in ${n} environment${n === 1 ? '' : 's'}; stability needs at least ${minimumEnvironments}`,
    });
    return false;
  });
  let es = environments.filter((e) => vs.some((v) => grown.has(key(v, e))));

  /** Each of `names` missing from some of `across`, with its share of empty cells. */
  const incomplete = (
    kind: 'variety' | 'environment',
    names: string[],
    across: string[],
    grownIn: (name: string, other: string) => boolean,
    firstOrder: number,
  ) =>
    names.flatMap((name, order) => {
      const present = across.filter((other) => grownIn(name, other)).length;
      if (present === across.length) return [];
      const share = 1 - present / across.length;
      return [{ kind, name, share, lost: present, order: firstOrder + order }];
    });

  for (;;) {
    const candidates = [
      ...incomplete('variety', vs, es, (v, e) => grown.has(key(v, e)), 0),
      ...incomplete('environment', es, vs, (e, v) => grown.has(key(v, e)), vs.length),
    ];
    if (candidates.length === 0) break;
    candidates.sort((a, b) => b.share - a.share || a.lost - b.lost || b.order - a.order);
    const drop = candidates[0]!;
    if (drop.kind === 'variety') {
      vs = vs.filter((v) => v !== drop.name);
      excludedVarieties.push({
        name: drop.name,
        reason: 'not grown in every environment of the balanced subset',
      });
    } else {
      es = es.filter((e) => e !== drop.name);
      excludedEnvironments.push({
        name: drop.name,
        reason: 'not every variety of the balanced subset was grown here',
      });
    }
  }
  return { varieties: vs, environments: es, excludedVarieties, excludedEnvironments };
}

export function stabilityAnalysis(
  cells: EnvironmentMean[],
  options: StabilityOptions = {},
): StabilityResult {
  const minimumEnvironments = Math.max(
    MIN_ENVIRONMENTS,
    options.minimumEnvironments ?? MIN_ENVIRONMENTS,
  );
  const values = new Map<string, number>();
  for (const c of cells) {
    if (!Number.isFinite(c.mean))
      throw new StabilityInputError(`${c.variety} in ${c.environment}: the mean is not a number`);
    const k = key(c.variety, c.environment);
    if (values.has(k))
      throw new StabilityInputError(`${c.variety} in ${c.environment} is given twice`);
    values.set(k, c.mean);
  }
  const subset = balancedSubset(cells, minimumEnvironments);
  const vs = subset.varieties;
  const es = subset.environments;
  if (es.length < minimumEnvironments || vs.length < 2) {
    throw new StabilityInputError(
      `The balanced subset has ${vs.length} varieties in ${es.length} environments; stability needs at least 2 varieties in ${minimumEnvironments} environments`,
    );
  }

  const g = vs.length;
  const n = es.length;
  const y = vs.map((v) => es.map((e) => values.get(key(v, e)) as number));
  const varietyMeans = y.map((row) => row.reduce((s, x) => s + x, 0) / n);
  const environmentMeans = es.map((_, j) => y.reduce((s, row) => s + row[j]!, 0) / g);
  const grandMean = varietyMeans.reduce((s, x) => s + x, 0) / g;
  const index = environmentMeans.map((m) => m - grandMean);
  const indexSs = index.reduce((s, x) => s + x * x, 0);
  if (!(indexSs > 0))
    throw new StabilityInputError(
      'Every environment has the same mean; there is no environment index to regress on',
    );

  const interaction = y.map((row, i) =>
    row.reduce((s, x, j) => {
      const r = x - varietyMeans[i]! - environmentMeans[j]! + grandMean;
      return s + r * r;
    }, 0),
  );
  const interactionSs = interaction.reduce((s, x) => s + x, 0);
  const deviationDf = n - 2;

  const varieties = vs.map((variety, i): VarietyStability => {
    const row = y[i]!;
    const mean = varietyMeans[i]!;
    const slope = row.reduce((s, x, j) => s + (x - mean) * index[j]!, 0) / indexSs;
    let residualSs = 0;
    let totalSs = 0;
    for (let j = 0; j < n; j++) {
      const d = row[j]! - mean;
      const r = d - slope * index[j]!;
      residualSs += r * r;
      totalSs += d * d;
    }
    const deviationMs = residualSs / deviationDf;
    const slopeSe = Math.sqrt(deviationMs / indexSs);
    const t = (slope - 1) / slopeSe;
    return {
      variety,
      mean,
      slope,
      slopeSe,
      rSquared: totalSs > 0 ? 1 - residualSs / totalSs : 1,
      slopeVersusOneT: t,
      slopeVersusOneP: studentTTwoSided(t, deviationDf),
      deviationMs,
      deviationDf,
      deviationVariance:
        options.pooledErrorOfMean === undefined ? null : deviationMs - options.pooledErrorOfMean,
      ecovalence: interaction[i]!,
      ecovalenceShare: interactionSs > 0 ? interaction[i]! / interactionSs : 0,
    };
  });

  return {
    usedVarieties: vs,
    usedEnvironments: es,
    excludedVarieties: subset.excludedVarieties,
    excludedEnvironments: subset.excludedEnvironments,
    grandMean,
    environments: es.map((environment, j) => ({
      environment,
      mean: environmentMeans[j]!,
      index: index[j]!,
    })),
    varieties,
  };
}

function key(variety: string, environment: string): string {
  return `${variety}\u0000${environment}`;
}

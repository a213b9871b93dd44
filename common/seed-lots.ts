/**
 * Rules about a seed lot that need no database: when its germination needs checking again,
 * and how well the plots sown from it stood.
 */
import type { LotWarning } from './contracts/seed';

/**
 * A germination result is trusted for a year: seed ages in store, so a lot is re-tested before
 * each sowing season (common practice, no source).
 */
export function testIsOld(testedOn: string, today: string): boolean {
  const [y, m, d] = today.split('-');
  // The same calendar day a year back; 29 February goes back to 28 February (29th does not exist).
  const yearBack = `${Number(y) - 1}-${m}-${m === '02' && d === '29' ? '28' : d}`;
  return testedOn < yearBack;
}

/** Why a lot is flagged, given its tests newest first and the group's threshold in percent. */
export function lotWarnings(
  tests: readonly { testedOn: string; percent: number }[],
  thresholdPercent: number,
  today: string,
): LotWarning[] {
  const last = tests[0];
  if (!last) return [{ kind: 'untested', message: 'No germination test yet: test before sowing.' }];
  const warnings: LotWarning[] = [];
  if (testIsOld(last.testedOn, today))
    warnings.push({
      kind: 'test_old',
      message: `The last germination test (${last.testedOn}) is over a year old: test again before sowing.`,
    });
  if (last.percent < thresholdPercent)
    warnings.push({
      kind: 'below_threshold',
      message: `The last test germinated ${formatPercent(last.percent)}, below the group’s ${thresholdPercent} %.`,
    });
  return warnings;
}

/** A percentage for reading: at most one decimal, no trailing zeros, no float noise. */
export function formatPercent(percent: number): string {
  return `${Number(percent.toFixed(1)).toLocaleString('en')} %`;
}

/**
 * The share of plants set that still stand, over the plots where both counts were recorded
 * (plots without either count say nothing about the stand). Null when no plot has both.
 */
export function standPercent(
  plots: readonly { plantsSet: number | null; plantsSurviving: number | null }[],
): number | null {
  let set = 0;
  let standing = 0;
  for (const p of plots) {
    if (p.plantsSet === null || p.plantsSurviving === null || p.plantsSet === 0) continue;
    set += p.plantsSet;
    standing += p.plantsSurviving;
  }
  return set === 0 ? null : (100 * standing) / set;
}

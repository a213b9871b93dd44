/**
 * How many decimals a number is shown or exported with: the precision it was recorded with,
 * never binary float noise (1942.6000000000004 is 1942.6). The analysis keeps full precision;
 * only what people read or download is rounded, by these rules (common practice, no source):
 *
 * - a recorded value, or a sum of recorded values: the recorded decimals;
 * - an average or ratio (a plot's mean of sample plants, per plant or per area, entry means,
 *   SD, SE, LSD, HSD, grand mean): the recorded decimals + 1;
 * - standardised scores and the ranking index (z scale): 2 decimals;
 * - percentages (CV): 1 decimal;
 * - in another unit, the same absolute precision: g to kg adds 3 decimals, mm to cm adds 1.
 *
 * Pure; shared by the server (CSV, PDF) and the screens.
 */

/** More decimals than anyone records in a garden trial; beyond this a value is noise. */
export const MAX_DECIMALS = 6;

/** Decimals a value needs, float noise ignored (0.1 + 0.2 needs 1). */
export function decimalsOf(value: number): number {
  if (!Number.isFinite(value)) return 0;
  for (let d = 0; d < MAX_DECIMALS; d++) {
    const rounded = Number(value.toFixed(d));
    if (Math.abs(rounded - value) <= 1e-9 * Math.max(1, Math.abs(value))) return d;
  }
  return MAX_DECIMALS;
}

/** The most decimals any of the recorded values has. */
export function recordedDecimals(values: Iterable<number>): number {
  let d = 0;
  for (const v of values) d = Math.max(d, decimalsOf(v));
  return d;
}

export type PrecisionKind = 'recorded' | 'mean' | 'score' | 'percent';

/** Decimals for a kind of figure, from the decimals of what was recorded. */
export function decimalsFor(kind: PrecisionKind, recorded: number): number {
  if (kind === 'score') return 2;
  if (kind === 'percent') return 1;
  return Math.min(MAX_DECIMALS, recorded + (kind === 'mean' ? 1 : 0));
}

/** Decimals after converting by `factor` (shown = stored × factor), keeping the same step. */
export function decimalsInUnit(decimals: number, factor: number): number {
  if (!(factor > 0)) return decimals;
  return Math.min(MAX_DECIMALS, Math.max(0, decimals + Math.round(-Math.log10(factor))));
}

/** Rounded to `decimals`; negative zero becomes 0 (no "-0.00"). */
export function roundTo(value: number, decimals: number): number {
  const r = Number(value.toFixed(Math.max(0, Math.min(20, decimals))));
  return r === 0 ? 0 : r;
}

/** For a file: plain digits, no grouping, trailing zeros kept off. */
export function exportNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  return String(roundTo(value, decimals));
}

/** For reading: grouped thousands, exactly `decimals` decimals (a column lines up). */
export function displayNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const d = Math.max(0, Math.min(20, decimals));
  return roundTo(value, d).toLocaleString('en', {
    minimumFractionDigits: d,
    maximumFractionDigits: d,
  });
}

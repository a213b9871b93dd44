/**
 * What fits in a plot. Rule, common practice (no source): a plant occupies one in-row spacing
 * along the row (half a spacing clear at each end), so a row holds floor(row length ÷ spacing)
 * plants; a plot of several rows holds that many per row.
 */

/** Tolerance for lengths typed in inches or feet that land a hair under a whole spacing. */
const EPSILON = 1e-9;

export function plantsPerRow(rowLengthMm: number, inRowSpacingMm: number): number {
  if (!(rowLengthMm > 0) || !Number.isFinite(rowLengthMm))
    throw new RangeError('Row length must be a positive length.');
  if (!(inRowSpacingMm > 0) || !Number.isFinite(inRowSpacingMm))
    throw new RangeError('In-row spacing must be a positive length.');
  return Math.floor(rowLengthMm / inRowSpacingMm + EPSILON);
}

export function plantsPerPlot(
  rowLengthMm: number,
  inRowSpacingMm: number,
  rowsPerPlot = 1,
): number {
  if (!Number.isInteger(rowsPerPlot) || rowsPerPlot < 1)
    throw new RangeError('Rows per plot must be a whole number of 1 or more.');
  return rowsPerPlot * plantsPerRow(rowLengthMm, inRowSpacingMm);
}

/** Ground a plot covers: its rows' length times the between-row spacing of each row, in m². */
export function plotAreaM2(rowLengthMm: number, rowSpacingMm: number, rowsPerPlot = 1): number {
  return (rowLengthMm / 1000) * (rowSpacingMm / 1000) * rowsPerPlot;
}

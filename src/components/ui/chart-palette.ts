/**
 * The one set of line colours for charts (leaf, pod, loam tones of the app's theme), so a
 * series looks the same on every chart that draws it.
 */
export const chartPalette = [
  '#2f5d3a',
  '#d98e2b',
  '#6b4f36',
  '#4a8a57',
  '#a8631a',
  '#8fbf98',
  '#1b3822',
  '#c7ad92',
] as const;

/** The colour of the i-th series, repeating when there are more series than colours. */
export const seriesColour = (i: number): string => chartPalette[i % chartPalette.length]!;

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

/** The app's ink (`--color-ink` in src/styles/index.css). */
const INK = '#1f2a1c';

/**
 * Every chart's tooltip: its text in ink on white, not in the series colours (several are too
 * light to read as text on white); the legend and the lines carry the colours.
 */
export const tooltipStyle = {
  contentStyle: {
    margin: 0,
    padding: 10,
    backgroundColor: '#ffffff',
    border: '1px solid #6b4f36',
    whiteSpace: 'nowrap',
    color: INK,
  },
  itemStyle: { display: 'block', paddingTop: 4, paddingBottom: 4, color: INK },
  labelStyle: { margin: 0, color: INK },
} as const;

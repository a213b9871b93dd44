/**
 * Plot labels for stakes: the label-sheet layouts they print on, and the plot's address that
 * each label's QR code holds. Pure: no I/O, no DOM.
 */

export interface LabelSheet {
  id: 'a4-24' | 'letter-30';
  name: string;
  /** CSS page size */
  page: 'A4' | 'letter';
  unit: 'mm' | 'in';
  columns: number;
  rows: number;
  labelWidth: number;
  labelHeight: number;
  marginTop: number;
  marginLeft: number;
  columnGap: number;
  rowGap: number;
}

/**
 * Two widely sold sheet layouts (common practice, no source; dimensions from memory of the
 * blank sheets' printed measurements): A4 with 3 × 8 labels of 70 × 37 mm, and US Letter with
 * 3 × 10 labels of 2⅝ × 1 in.
 */
export const labelSheets: readonly LabelSheet[] = [
  {
    id: 'a4-24',
    name: 'A4, 24 labels (70 × 37 mm, 3 across)',
    page: 'A4',
    unit: 'mm',
    columns: 3,
    rows: 8,
    labelWidth: 70,
    labelHeight: 37,
    marginTop: 0.5,
    marginLeft: 0,
    columnGap: 0,
    rowGap: 0,
  },
  {
    id: 'letter-30',
    name: 'US Letter, 30 labels (2⅝ × 1 in, 3 across)',
    page: 'letter',
    unit: 'in',
    columns: 3,
    rows: 10,
    labelWidth: 2.625,
    labelHeight: 1,
    marginTop: 0.5,
    marginLeft: 0.1875,
    columnGap: 0.125,
    rowGap: 0,
  },
];

/** Splits the labels into pages of one sheet each. */
export function labelPages<T>(labels: readonly T[], sheet: LabelSheet): T[][] {
  const perPage = sheet.columns * sheet.rows;
  const pages: T[][] = [];
  for (let i = 0; i < labels.length; i += perPage) pages.push(labels.slice(i, i + perPage));
  return pages;
}

/** The address a plot's label holds: the field log, opened at that plot. */
export function plotAddress(origin: string, slug: string, plotId: string): string {
  return `${origin.replace(/\/$/, '')}/t/${encodeURIComponent(slug)}/log?plot=${encodeURIComponent(plotId)}`;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * The app path a scanned label leads to, or null when the code is not one of our plot labels
 * (another site's address, or any other text): a scan never leaves the app.
 */
export function readPlotAddress(
  text: string,
  origin: string,
): { path: string; slug: string; plotId: string } | null {
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    return null;
  }
  if (url.origin !== new URL(origin).origin) return null;
  const m = /^\/t\/([a-z0-9]+(?:-[a-z0-9]+)*)\/log$/.exec(url.pathname);
  const plotId = url.searchParams.get('plot');
  if (!m || !plotId || !UUID.test(plotId)) return null;
  return { path: `/t/${m[1]}/log?plot=${plotId}`, slug: m[1]!, plotId };
}

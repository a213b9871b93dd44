/**
 * The one CSV writer for every file the client or the server offers for download, and the
 * reading back of its cells.
 *
 * Quoting follows RFC 4180 (a field holding a comma, a double quote or a line break is enclosed
 * in double quotes, with its double quotes doubled); records end with a line feed.
 *
 * Text cells that a spreadsheet would run as a formula (starting with = + - @, tab or carriage
 * return) are written with a leading apostrophe, so a downloaded file cannot carry a live
 * formula; numbers are left alone. Reading our own files back drops that apostrophe again.
 * The characters and the apostrophe are those of OWASP's "CSV Injection" page (from memory).
 */
const formulaStart = /^[=+\-@\t\r]/;
const plainNumber = /^[+-]?\d+(\.\d+)?([eE][+-]?\d+)?$/;

export function spreadsheetSafe(value: unknown): unknown {
  if (typeof value !== 'string' || !formulaStart.test(value)) return value;
  // A plain number such as "-3.5" is data, not a formula.
  if (plainNumber.test(value)) return value;
  return `'${value}`;
}

export function fromSpreadsheetSafe(cell: string): string {
  return cell.startsWith("'") && formulaStart.test(cell.slice(1)) ? cell.slice(1) : cell;
}

/** One field: empty for null/undefined, numbers as JavaScript writes them, formulas defused. */
function field(value: unknown): string {
  const safe = spreadsheetSafe(value);
  const text =
    safe === null || safe === undefined
      ? ''
      : safe instanceof Date
        ? safe.toISOString()
        : String(safe);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A CSV file: the header row, then one row per record (cells in the header's order). */
export function writeCsv(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return [header, ...rows].map((row) => row.map(field).join(',')).join('\n') + '\n';
}

/** Several tables in one file, each with its own header, separated by an empty line. */
export function writeCsvSections(
  sections: readonly { header: readonly string[]; rows: readonly (readonly unknown[])[] }[],
): string {
  return sections.map((s) => writeCsv(s.header, s.rows)).join('\n');
}

/**
 * The header of a two-factor trial's treatment column: the treatment's own name (as the lead
 * wrote it, e.g. "Fertilizer") unless that names another column of the file, else "treatment".
 */
export function treatmentColumn(name: string, columns: readonly string[]): string {
  const lower = name.trim().toLowerCase();
  return lower && !columns.some((c) => c.toLowerCase() === lower) ? name.trim() : 'treatment';
}

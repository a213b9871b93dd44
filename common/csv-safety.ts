/**
 * Text cells that a spreadsheet would run as a formula (starting with = + - @, tab or carriage
 * return) are written with a leading apostrophe, so a downloaded file cannot carry a live
 * formula; numbers are left alone. Reading our own files back drops that apostrophe again.
 * Common practice (no source) for CSV files meant to be opened in spreadsheets.
 */
const formulaStart = /^[=+\-@\t\r]/;

export function spreadsheetSafe(value: unknown): unknown {
  if (typeof value !== 'string' || !formulaStart.test(value)) return value;
  // A plain number such as "-3.5" is data, not a formula.
  if (/^[+-]?\d+(\.\d+)?([eE][+-]?\d+)?$/.test(value)) return value;
  return `'${value}`;
}

export function fromSpreadsheetSafe(cell: string): string {
  return cell.startsWith("'") && formulaStart.test(cell.slice(1)) ? cell.slice(1) : cell;
}

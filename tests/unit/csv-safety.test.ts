import { describe, expect, it } from 'vitest';
import { fromSpreadsheetSafe, spreadsheetSafe } from '../../common/csv-safety';

// Cells a spreadsheet would evaluate: those starting with = + - @ (common practice, no source).
describe('spreadsheet-safe CSV cells', () => {
  it('defuses text that a spreadsheet would run as a formula, and reads it back as typed', () => {
    for (const text of ['=HYPERLINK("http://x")', '+1+2', '-cmd', '@SUM(A1)', '\t=1']) {
      const written = spreadsheetSafe(text) as string;
      expect(written).toBe(`'${text}`);
      expect(fromSpreadsheetSafe(written)).toBe(text);
    }
  });

  it('leaves numbers, negative numbers and ordinary text alone', () => {
    for (const value of [-3.5, 42, '-3.5', '+2', '1e-3', 'Mossbank Long', "it's fine", '']) {
      expect(spreadsheetSafe(value)).toBe(value);
    }
    expect(fromSpreadsheetSafe("'plain")).toBe("'plain");
  });
});

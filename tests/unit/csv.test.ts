/**
 * The one CSV writer and the one decimal rule.
 * Quoting: RFC 4180, section 2 (rules 5-7 and the examples there). Formula cells: the
 * characters OWASP's "CSV Injection" page lists (from memory). The decimal rule is ours
 * (common/decimal.ts); the cases below are each reading it allows or refuses.
 */
import { describe, expect, it } from 'vitest';
import { fromSpreadsheetSafe, spreadsheetSafe, writeCsv, writeCsvSections } from '../../common/csv';
import { readDecimal, readDecimalText, readNumberField } from '../../common/decimal';

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

describe('the CSV writer', () => {
  it('quotes as RFC 4180 does: commas, line breaks and doubled double quotes', () => {
    // RFC 4180 section 2, rule 7: "aaa","b""bb","ccc" — fields are only quoted when needed here.
    expect(writeCsv(['a', 'b', 'c'], [['aaa', 'b"bb', 'ccc']])).toBe('a,b,c\naaa,"b""bb",ccc\n');
    expect(writeCsv(['x'], [['b\r\nbb'], ['1,5']])).toBe('x\n"b\r\nbb"\n"1,5"\n');
  });

  it('writes blanks for missing values and never a live formula', () => {
    expect(
      writeCsv(
        ['v', 'n'],
        [
          [null, undefined],
          ['=1+1', -2.5],
        ],
      ),
    ).toBe("v,n\n,\n'=1+1,-2.5\n");
    expect(writeCsv(['note'], [['=HYPERLINK("http://x","y")']])).toBe(
      'note\n"\'=HYPERLINK(""http://x"",""y"")"\n',
    );
  });

  it('writes sections separated by an empty line, each with its header', () => {
    expect(
      writeCsvSections([
        { header: ['source', 'df'], rows: [['variety', 2]] },
        { header: ['rank', 'variety'], rows: [[1, '@Brine Lantern']] },
      ]),
    ).toBe("source,df\nvariety,2\n\nrank,variety\n1,'@Brine Lantern\n");
  });
});

describe('the decimal rule', () => {
  it('reads a point or a comma as the decimal mark', () => {
    expect(readDecimal('12.5')).toBe(12.5);
    expect(readDecimal('12,5')).toBe(12.5);
    expect(readDecimal(' 0,25 ')).toBe(0.25);
    expect(readDecimal('-3')).toBe(-3);
    expect(readDecimal('1e-3')).toBe(0.001);
    expect(readDecimal('1234,5678')).toBe(1234.5678);
    expect(readDecimalText('1000000000000,3')).toEqual({ ok: true, text: '1000000000000.3' });
  });

  it('refuses thousands separators and a comma that could be either mark', () => {
    for (const text of ['1,234.5', '1.234,5', '1,234,567', 'ten', '', '1,2,3']) {
      expect(readDecimal(text)).toBeNull();
    }
    expect(readDecimalText('1,250')).toEqual({
      ok: false,
      message: '"1,250" could be 1250 or 1.250: write it as one of those.',
    });
    expect(readDecimalText('1,234.5')).toMatchObject({ ok: false });
  });

  it('reads a form field: blank is nothing, anything else not a number is NaN', () => {
    expect(readNumberField('  ')).toBeNull();
    expect(readNumberField('2,75')).toBe(2.75);
    expect(readNumberField('2 kg')).toBeNaN();
  });
});

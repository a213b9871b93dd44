/**
 * How a typed number is read, everywhere: forms, imported CSV cells, the spreadsheet analysis.
 *
 * The decimal mark is a point, or a comma in its place (phone keypads in many languages offer
 * only a comma): 12.5 and 12,5 are both twelve and a half. There are no thousands separators,
 * so a number with both marks (1,234.5 or 1.234,5) is refused, and so is a single comma
 * followed by exactly three digits (1,234), which could be either reading: write 1234 or
 * 1.234. Exponents (1e-3) and a leading sign are allowed.
 */
export type DecimalReading = { ok: true; text: string } | { ok: false; message: string };

const POINT_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** The number as point-decimal text (exact, for the analysis), or why it is not one. */
export function readDecimalText(input: string): DecimalReading {
  const t = input.trim();
  if (t === '') return { ok: false, message: 'Enter a number.' };
  const commas = (t.match(/,/g) ?? []).length;
  if (commas > 1 || (commas === 1 && t.includes('.')))
    return {
      ok: false,
      message: `"${t}" has a thousands separator: write the number without one (1234.5).`,
    };
  if (commas === 1 && /,\d{3}(?:[eE]|$)/.test(t))
    return {
      ok: false,
      message: `"${t}" could be ${t.replace(',', '')} or ${t.replace(',', '.')}: write it as one of those.`,
    };
  const text = t.replace(',', '.');
  if (!POINT_DECIMAL.test(text)) return { ok: false, message: `"${t}" is not a number.` };
  return { ok: true, text };
}

/** The number read by the rule above, or null when it is not one. */
export function readDecimal(input: string): number | null {
  const r = readDecimalText(input);
  if (!r.ok) return null;
  const n = Number(r.text);
  return Number.isFinite(n) ? n : null;
}

/** A form field read by the rule above: blank is null, anything that is not a number is NaN. */
export function readNumberField(input: string): number | null {
  if (input.trim() === '') return null;
  return readDecimal(input) ?? Number.NaN;
}

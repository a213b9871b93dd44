/**
 * Exact reading of decimal text and removal of a common offset.
 *
 * Trial records are typed in as decimal text (e.g. "1000000000000.3"). Converting such text
 * straight to a double can destroy the digits that carry the variation, so values are read
 * exactly, a common offset (the value of the median observation) is subtracted exactly, and
 * only the small deviations are converted to floating point. Sums of squares are
 * shift-invariant, so the analysis runs on the deviations; means add the offset back.
 */
import Decimal from 'decimal.js';

// A plain decimal number: optional sign, digits with an optional fraction, optional exponent.
const DECIMAL_TEXT = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
// The fast path handles sign, digits and fraction without exponent.
const PLAIN_FIXED = /^([+-]?)(\d*)(?:\.(\d*))?$/;

/** Largest count of significant digits whose integer form is always exact in a double. */
const EXACT_DIGITS = 15;

/** Canonical decimal text for a number or text value; throws on anything else. */
export function toDecimalText(value: string | number): string {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new RangeError(`${value} is not a finite number`);
    // String() gives the shortest text that reads back as the same double, which is what the
    // person or database meant by this number.
    return String(value);
  }
  const t = value.trim();
  if (!DECIMAL_TEXT.test(t)) throw new RangeError(`"${value}" is not a number`);
  return t;
}

export interface CentredValues {
  /** value − offset for each input, rounded once to double. */
  deviations: Float64Array;
  /** The exact offset that was subtracted, as decimal text. */
  offset: string;
  /** The offset as a double (for adding back to means). */
  offsetNumber: number;
}

interface ScaledInt {
  negative: boolean;
  digits: string; // integer digits with the fraction appended
  fractionDigits: number;
}

function splitFixed(text: string): ScaledInt | null {
  const m = PLAIN_FIXED.exec(text);
  if (!m) return null;
  const intPart = m[2] ?? '';
  const frac = m[3] ?? '';
  if (intPart === '' && frac === '') return null;
  return { negative: m[1] === '-', digits: intPart + frac, fractionDigits: frac.length };
}

/**
 * Subtract the median observation from every value exactly and return the deviations.
 * Values are decimal texts (see toDecimalText).
 */
export function centreDecimalTexts(texts: readonly string[]): CentredValues {
  const n = texts.length;
  const deviations = new Float64Array(n);
  if (n === 0) return { deviations, offset: '0', offsetNumber: 0 };

  // Fast exact path: scale every value to an integer with a common count of fraction
  // digits. Integers up to 15 digits are exact doubles and so are their differences;
  // the one division by a power of ten rounds once.
  const parts: ScaledInt[] = [];
  let scale = 0;
  let fast = true;
  for (const t of texts) {
    const p = splitFixed(t);
    if (!p) {
      fast = false;
      break;
    }
    parts.push(p);
    if (p.fractionDigits > scale) scale = p.fractionDigits;
  }
  if (fast && scale <= 22) {
    const ints = new Float64Array(n);
    for (let i = 0; i < n && fast; i++) {
      const p = parts[i]!;
      const significant = p.digits.replace(/^0+/, '').length + (scale - p.fractionDigits);
      if (significant > EXACT_DIGITS) {
        fast = false;
        break;
      }
      const v = Number(p.digits + '0'.repeat(scale - p.fractionDigits));
      ints[i] = p.negative ? -v : v;
    }
    if (fast) {
      const medianIndex = indexOfMedian(ints);
      const base = ints[medianIndex]!;
      const divisor = 10 ** scale;
      for (let i = 0; i < n; i++) deviations[i] = (ints[i]! - base) / divisor;
      const offset = texts[medianIndex]!;
      return { deviations, offset, offsetNumber: Number(offset) };
    }
  }

  // General path: exact decimal arithmetic.
  const decimals = texts.map((t) => new Decimal(t));
  const approx = Float64Array.from(decimals, (d) => d.toNumber());
  const base = decimals[indexOfMedian(approx)]!;
  for (let i = 0; i < n; i++) deviations[i] = decimals[i]!.minus(base).toNumber();
  return { deviations, offset: base.toString(), offsetNumber: base.toNumber() };
}

/** Index of a median element (the lower middle for even n). */
function indexOfMedian(values: Float64Array): number {
  const order = Array.from(values.keys()).sort((a, b) => values[a]! - values[b]!);
  return order[(order.length - 1) >> 1]!;
}

/** offset + deviation, added in exact decimal and rounded once. */
export function addOffset(offset: string, deviation: number): number {
  if (deviation === 0) return Number(offset);
  return new Decimal(offset).plus(new Decimal(deviation)).toNumber();
}

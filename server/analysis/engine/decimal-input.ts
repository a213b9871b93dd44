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

/**
 * Reads plain fixed-point text (sign, digits, optional fraction; no exponent) as its digits
 * taken as an integer, into ints[i], and returns the count of fraction digits; -1 when the text
 * is not plain or has more than EXACT_DIGITS significant digits (then the integer may not be
 * exact). The integer is built digit by digit, exactly, since it stays below 10^15.
 */
function readScaled(text: string, ints: Float64Array, i: number, negativeExponent = false): number {
  let at = 0;
  let negative = false;
  const first = text.charCodeAt(0);
  if (first === 43 /* + */ || first === 45 /* - */) {
    negative = first === 45;
    at = 1;
  }
  let v = 0;
  let significant = 0;
  let digits = 0;
  let fraction = -1;
  let end = text.length;
  let shift = 0;
  if (negativeExponent) {
    // "1.5e-7", as String() writes small numbers: the exponent widens the scale.
    const e = text.indexOf('e-');
    if (e >= 0) {
      shift = Number(text.slice(e + 2));
      if (!(shift >= 1 && shift <= 400 && Number.isInteger(shift))) return -1;
      end = e;
    }
  }
  for (; at < end; at++) {
    const c = text.charCodeAt(at);
    if (c === 46 /* . */ && fraction < 0) {
      fraction = 0;
      continue;
    }
    const d = c - 48;
    if (d < 0 || d > 9) return -1;
    digits++;
    if (fraction >= 0) fraction++;
    if (v === 0 && d === 0) continue;
    if (++significant > EXACT_DIGITS) return -1;
    v = v * 10 + d;
  }
  if (digits === 0) return -1;
  ints[i] = negative ? -v : v;
  return (fraction < 0 ? 0 : fraction) + shift;
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
  // digits. Integers up to 15 digits are exact doubles and so are their differences
  // (and a product of such an integer with a power of ten that stays below 10^15);
  // the one division by a power of ten rounds once.
  const ints = new Float64Array(n);
  const fractions = new Int32Array(n);
  let scale = 0;
  let fast = true;
  for (let i = 0; i < n; i++) {
    const f = readScaled(texts[i]!, ints, i);
    if (f < 0) {
      fast = false;
      break;
    }
    fractions[i] = f;
    if (f > scale) scale = f;
  }
  if (fast && scale <= 22) {
    for (let i = 0; i < n; i++) {
      const widen = scale - fractions[i]!;
      if (widen === 0) continue;
      const v = ints[i]!;
      // Significant digits after widening; zero stays zero at any scale.
      if (v !== 0 && Math.abs(v) * 10 ** widen >= 10 ** EXACT_DIGITS) {
        fast = false;
        break;
      }
      ints[i] = v * 10 ** widen;
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

/**
 * Index of a median element (the lower middle for even n); among equal values, the one a
 * stable sort of the indices by value would put there.
 */
function indexOfMedian(values: Float64Array): number {
  const n = values.length;
  const middle = (n - 1) >> 1;
  const median = Float64Array.from(values).sort()[middle]!;
  let below = 0;
  for (let i = 0; i < n; i++) if (values[i]! < median) below++;
  let tie = middle - below;
  for (let i = 0; i < n; i++) if (values[i] === median && tie-- === 0) return i;
  return middle;
}

/** offset + deviation, added in exact decimal and rounded once. */
export function addOffset(offset: string, deviation: number): number {
  if (deviation === 0) return Number(offset);
  // One analysis adds the same offset to every mean: read it once.
  if (offset !== lastOffset.text) lastOffset = readOffset(offset);
  const o = lastOffset;
  // The same deviation comes back (an entry's mean and its adjusted mean on a balanced layout).
  const known = o.sums.get(deviation);
  if (known !== undefined) return known;
  const sum = exactSum(o, deviation);
  if (o.sums.size >= 4096) o.sums.clear();
  o.sums.set(deviation, sum);
  return sum;
}

function exactSum(o: Offset, deviation: number): number {
  // The deviation is taken as its shortest decimal text (as the exact sum below reads it).
  // When both are short fixed-point numbers the sum is an integer count of 10^-scale below
  // 2^53: exact in double, and one division by an exact power of ten rounds it once.
  const dScale = o.scale >= 0 ? readScaled(String(deviation), scratch, 0, true) : -1;
  if (dScale >= 0) {
    const scale = o.scale > dScale ? o.scale : dScale;
    if (scale <= 22) {
      const a = o.int * POWERS_OF_TEN[scale - o.scale]!;
      const b = scratch[0]! * POWERS_OF_TEN[scale - dScale]!;
      const sum = a + b;
      if (Math.abs(a) < TWO_53 && Math.abs(b) < TWO_53 && Math.abs(sum) < TWO_53)
        return sum / POWERS_OF_TEN[scale]!;
    }
  }
  o.exact ??= new Decimal(o.text);
  return o.exact.plus(new Decimal(deviation)).toNumber();
}

interface Offset {
  text: string;
  /** Exact decimal, made on first use. */
  exact: Decimal | null;
  /** Sums already worked out, by deviation. */
  sums: Map<number, number>;
  /** The text as int × 10^-scale, scale −1 when it is not short plain fixed-point. */
  int: number;
  scale: number;
}

function readOffset(text: string): Offset {
  const scale = readScaled(text, scratch, 0);
  return { text, exact: null, sums: new Map(), int: scale >= 0 ? scratch[0]! : 0, scale };
}

const TWO_53 = 2 ** 53;
/** 10^0 … 10^22, each exact in double (written out, not computed). */
const POWERS_OF_TEN = [
  1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17,
  1e18, 1e19, 1e20, 1e21, 1e22,
];
const scratch = new Float64Array(1);
let lastOffset: Offset = readOffset('0');

/**
 * What a person types into a form, read into what a contract takes: every form field is text,
 * and these turn it into the contract's value before the contract checks it, so the contract's
 * messages are the form's messages.
 */
import { z } from 'zod';
import { readNumberField } from '../decimal';

type TypedNumberOptions = { blank?: null; toStored?: (typed: number) => number };

/**
 * A number typed into a form, read by the one decimal-mark rule (common/decimal.ts). A blank
 * field becomes `blank` (absent unless said), text that is not a number stays NaN so the
 * contract's own "enter a number" message answers it, and `toStored` converts a typed value
 * from the unit shown beside the field to the unit the contract takes (cm → mm).
 */
export function readTypedNumber(text: string, { blank, toStored }: TypedNumberOptions = {}) {
  const n = readNumberField(text);
  if (n === null) return blank;
  return toStored && Number.isFinite(n) ? toStored(n) : n;
}

/** A form field holding a typed number, read by `readTypedNumber` before `schema` checks it. */
export const typedNumber = <T extends z.ZodType>(schema: T, options: TypedNumberOptions = {}) =>
  z.preprocess((v) => (typeof v === 'string' ? readTypedNumber(v, options) : v), schema);

/** A text field that may be left blank for "none" (a date not yet known, a choice not made). */
export const blankAsNull = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? null : v), schema);

/** A text field that may be left blank, sent as absent. */
export const blankAsAbsent = <T extends z.ZodType>(schema: T) =>
  z.preprocess((v) => (typeof v === 'string' && v.trim() === '' ? undefined : v), schema);

/**
 * Plausible values: a value outside its trait's range is asked about before it is saved and
 * flagged in the record tables, but never refused (a giant fruit can be real). What a range
 * measures depends on where the trait's values come from: a measured trait's own value (g, mm,
 * count, %); for a trait read from harvest records, the mass per fruit (harvest mass) or the
 * fruit in one harvest (harvest count). Scores have their scale and dates no range.
 */
import type { UnitSystem } from './contracts/me';
import type { TraitDisplayUnit } from './contracts/trials';
import { type DisplayUnit, columnUnit, displayUnit, formatNumber } from './display-units';
import { harvestRanges } from './trait-presets';

export interface RangeTrait {
  label: string;
  quantityKind: string;
  basis: string;
  displayUnit?: TraitDisplayUnit | null;
  plausibleMin: number | null;
  plausibleMax: number | null;
}

interface Range {
  min: number | null;
  max: number | null;
}

/** A question reads better with about three digits than with a table's four. */
const approx = (value: number, unit: DisplayUnit) =>
  `${formatNumber(value * unit.factor, 3)}${unit.label ? ` ${unit.label}` : ''}`;

const outside = (value: number, r: Range) =>
  (r.min !== null && value < r.min) || (r.max !== null && value > r.max);

/** The unit a range of a kind is written in: "g" for a mass, "cm" for a length, none for counts. */
const rangeUnit = (quantityKind: string, system: UnitSystem, chosen?: TraitDisplayUnit | null) =>
  columnUnit(quantityKind, system, [], chosen).shown;

/** "20–400 cm", "from 0.5 g", "up to 1,000". */
export function describeRange(
  r: Range,
  quantityKind: string,
  system: UnitSystem,
  chosen?: TraitDisplayUnit | null,
): string {
  const unit = rangeUnit(quantityKind, system, chosen);
  const show = (v: number) => approx(v, unit);
  const bare = (v: number) => formatNumber(v * unit.factor, 3);
  if (r.min !== null && r.max !== null) return `${bare(r.min)}–${show(r.max)}`;
  if (r.min !== null) return `from ${show(r.min)}`;
  if (r.max !== null) return `up to ${show(r.max)}`;
  return '';
}

const rangeOf = (t: RangeTrait): Range => ({ min: t.plausibleMin, max: t.plausibleMax });

/**
 * The question to ask about a measured value (stored units), or null when it is plausible.
 * Scores and dates are never asked about here (a score's scale is a rule, not a doubt).
 */
export function observationDoubt(
  value: number,
  trait: RangeTrait,
  system: UnitSystem,
): string | null {
  if (trait.basis === 'harvest' || trait.quantityKind === 'score' || trait.quantityKind === 'date')
    return null;
  const r = rangeOf(trait);
  if (!outside(value, r)) return null;
  const unit = rangeUnit(trait.quantityKind, system, trait.displayUnit);
  return `${trait.label} ${approx(value, unit)} is outside the plausible ${describeRange(r, trait.quantityKind, system, trait.displayUnit)}.`;
}

/** The ranges a harvest record is checked against: the trial's harvest traits', else the usual ones. */
export function harvestChecks(traits: readonly RangeTrait[]) {
  const mass = traits.find((t) => t.basis === 'harvest' && t.quantityKind === 'mass');
  const count = traits.find((t) => t.basis === 'harvest' && t.quantityKind === 'count');
  return {
    massPerFruit: mass ? rangeOf(mass) : harvestRanges.massPerFruitG,
    massUnit: mass?.displayUnit ?? null,
    fruitPerHarvest: count ? rangeOf(count) : harvestRanges.fruitPerHarvest,
  };
}

/** The questions to ask about one harvest record (mass in g), none when it is plausible. */
export function harvestDoubts(
  h: { fruitCount: number; massG: number },
  traits: readonly RangeTrait[],
  system: UnitSystem,
): string[] {
  const checks = harvestChecks(traits);
  const doubts: string[] = [];
  if (outside(h.fruitCount, checks.fruitPerHarvest))
    doubts.push(
      `${formatNumber(h.fruitCount)} fruit in one harvest is outside the plausible ${describeRange(checks.fruitPerHarvest, 'count', system)}.`,
    );
  if (h.fruitCount > 0) {
    const perFruit = h.massG / h.fruitCount;
    if (outside(perFruit, checks.massPerFruit)) {
      const unit = displayUnit('g', system, 0, checks.massUnit);
      doubts.push(
        `${approx(perFruit, unit)} per fruit is outside the plausible ${describeRange(checks.massPerFruit, 'mass', system, checks.massUnit)} per fruit.`,
      );
    }
  } else if (h.massG > 0) {
    doubts.push('A mass with no fruit counted: was the count left out?');
  }
  return doubts;
}

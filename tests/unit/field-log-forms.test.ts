/**
 * The field-log forms' contracts: what a grower types (text) becomes numbers by the one
 * decimal-mark rule, and each problem carries the contract's own message on its field.
 */
import { describe, expect, it } from 'vitest';
import {
  harvestEntryForm,
  measureEntryForm,
  scoreEntryForm,
  standCountEntryForm,
} from '../../common/contracts/records';

const problems = (r: {
  success: boolean;
  error?: { issues: { path: PropertyKey[]; message: string }[] };
}) => (r.success ? [] : r.error!.issues.map((i) => [i.path.join('.'), i.message]));

describe('the harvest form', () => {
  const blank = { marketableCount: '', marketableMass: '', cullCount: '', cullMass: '', note: '' };

  it('takes marketable and cull in one save, a decimal comma read as a point', () => {
    expect(
      harvestEntryForm.parse({
        ...blank,
        marketableCount: '12',
        marketableMass: '1,5',
        cullCount: '2',
        cullMass: '0.25',
      }),
    ).toEqual({ marketableCount: 12, marketableMass: 1.5, cullCount: 2, cullMass: 0.25, note: '' });
    expect(harvestEntryForm.parse({ ...blank, cullCount: '3', cullMass: '40' })).toMatchObject({
      marketableCount: undefined,
      cullCount: 3,
    });
  });

  it('names the missing half of a pair, and asks for something when all is blank', () => {
    expect(problems(harvestEntryForm.safeParse({ ...blank, marketableCount: '4' }))).toEqual([
      ['marketableMass', 'Enter the mass of these fruit too.'],
    ]);
    expect(problems(harvestEntryForm.safeParse({ ...blank, cullMass: '9' }))).toEqual([
      ['cullCount', 'Enter how many fruit too.'],
    ]);
    expect(problems(harvestEntryForm.safeParse(blank))).toEqual([
      ['marketableCount', 'Enter the marketable count and mass, the cull, or both.'],
    ]);
  });

  it('refuses a fractional or negative count and text that is not a number', () => {
    expect(
      problems(
        harvestEntryForm.safeParse({ ...blank, marketableCount: '2.5', marketableMass: '-1' }),
      ),
    ).toEqual([
      ['marketableCount', 'Marketable count must be a whole number.'],
      ['marketableMass', 'Marketable mass cannot be negative.'],
    ]);
    expect(
      problems(
        harvestEntryForm.safeParse({ ...blank, marketableCount: 'ten', marketableMass: '5' }),
      ),
    ).toEqual([['marketableCount', 'Marketable count must be a whole number.']]);
  });
});

describe('the trait forms', () => {
  const height = {
    label: 'Plant height',
    quantityKind: 'length',
    scaleMin: null,
    scaleMax: null,
  } as const;
  const disease = { label: 'Disease', quantityKind: 'score', scaleMin: 0, scaleMax: 5 } as const;

  it('measures: blanks skipped, at least one value, each checked by the trait rule', () => {
    expect(measureEntryForm(height).parse({ values: ['', '92,5', ''] })).toEqual({
      values: [undefined, 92.5, undefined],
    });
    expect(problems(measureEntryForm(height).safeParse({ values: ['', ''] }))).toEqual([
      ['values.0', 'Enter at least one value.'],
    ]);
    expect(problems(measureEntryForm(height).safeParse({ values: ['10', '-3'] }))).toEqual([
      ['values.1', 'Plant height cannot be negative.'],
    ]);
  });

  it('scores on the trait scale (0 allowed where the scale starts at 0)', () => {
    expect(scoreEntryForm(disease).parse({ score: '0' })).toEqual({ score: 0 });
    expect(problems(scoreEntryForm(disease).safeParse({ score: '' }))).toEqual([
      ['score', 'Choose a score from 0 to 5.'],
    ]);
    expect(problems(scoreEntryForm(disease).safeParse({ score: '6' }))).toEqual([
      ['score', 'Disease is scored from 0 to 5.'],
    ]);
  });

  it('stand count: never more plants than were set', () => {
    expect(standCountEntryForm(20).parse({ plantsSurviving: '18' })).toEqual({
      plantsSurviving: 18,
    });
    expect(problems(standCountEntryForm(20).safeParse({ plantsSurviving: '21' }))).toEqual([
      ['plantsSurviving', 'The plot was set with 20 plants; the stand cannot be more.'],
    ]);
  });
});

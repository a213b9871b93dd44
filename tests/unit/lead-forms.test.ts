/**
 * The lead's forms' contracts (design, one day of weather, the results sheet): typed text becomes the body the server takes, lengths typed in
 * the unit shown beside the field arrive in millimetres, blanks mean "none", and each problem
 * carries the contract's own message on the field the form shows.
 * Inch: exactly 25.4 mm (international yard and pound agreement of 1959; NIST SP 811, B.8);
 * foot: exactly 304.8 mm (same source).
 */
import { describe, expect, it } from 'vitest';
import {
  createTrialForm,
  customTraitForm,
  entryForm,
  layoutForm,
  plantingForm,
  siteForm,
  trialSettingsForm,
} from '../../common/contracts/design';
import { saveSheetForm } from '../../common/contracts/results';
import { weatherDayForm } from '../../common/contracts/weather';

const problems = (r: {
  success: boolean;
  error?: { issues: { path: PropertyKey[]; message: string }[] };
}) => (r.success ? [] : r.error!.issues.map((i) => [i.path.join('.'), i.message]));

const entry = {
  code: 'CL3',
  name: 'Clemmons Longpod',
  seedSource: '',
  seedLot: '',
  entryType: 'heirloom',
  daysToMaturityClaimed: '',
  inRowSpacingMm: '',
  noFertilizer: false,
  notes: '',
  // The register select's first choice: find or make a variety of the entry's name.
  varietyId: '',
};

describe('the entry form', () => {
  it('reads spacing typed in cm or inches into mm, a decimal comma as a point', () => {
    expect(entryForm('cm').parse({ ...entry, inRowSpacingMm: '45,5' }).inRowSpacingMm).toBe(455);
    expect(entryForm('in').parse({ ...entry, inRowSpacingMm: '18' }).inRowSpacingMm).toBeCloseTo(
      457.2,
      9,
    );
  });

  it('sends blank days and spacing as none', () => {
    expect(entryForm('cm').parse(entry)).toMatchObject({
      daysToMaturityClaimed: null,
      inRowSpacingMm: null,
    });
  });

  it('answers bad fields with the contract’s messages', () => {
    expect(
      problems(
        entryForm('cm').safeParse({
          ...entry,
          code: 'TOOLONG1',
          daysToMaturityClaimed: 'soon',
          inRowSpacingMm: '-3',
        }),
      ),
    ).toEqual([
      ['code', 'Use 1 to 6 letters or digits for the code.'],
      ['daysToMaturityClaimed', 'Enter the days as a number.'],
      ['inRowSpacingMm', 'The in-row spacing must be more than zero.'],
    ]);
    expect(
      problems(entryForm('cm').safeParse({ ...entry, daysToMaturityClaimed: '1,234' })),
    ).toEqual([['daysToMaturityClaimed', 'Enter the days as a number.']]);
  });
});

describe('the layout form', () => {
  const typed = {
    replicates: '3',
    rowsPerPlot: '',
    rowLengthMm: '10',
    rowSpacingMm: '36',
    inRowSpacingMm: '',
    seed: '',
  };

  it('converts feet and inches, leaves a blank seed out and rows per plot at 1', () => {
    const body = layoutForm({ rowLength: 'ft', spacing: 'in' }).parse(typed);
    expect(body.rowLengthMm).toBeCloseTo(3048, 9);
    expect(body.rowSpacingMm).toBeCloseTo(914.4, 9);
    expect(body).toMatchObject({ replicates: 3, rowsPerPlot: 1, inRowSpacingMm: null });
    expect(body.seed).toBeUndefined();
    expect(
      layoutForm({ rowLength: 'm', spacing: 'cm' }).parse({ ...typed, seed: '4242' }),
    ).toMatchObject({
      rowLengthMm: 10_000,
      rowSpacingMm: 360,
      seed: 4242,
    });
  });

  it('asks for the row length and refuses a fractional block count', () => {
    expect(
      problems(
        layoutForm({ rowLength: 'm', spacing: 'cm' }).safeParse({
          ...typed,
          replicates: '2.5',
          rowLengthMm: '',
        }),
      ),
    ).toEqual([
      ['replicates', 'Use a whole number of replicates.'],
      ['rowLengthMm', 'Enter the row length as a number.'],
    ]);
  });
});

describe('the trial forms', () => {
  const trial = {
    title: 'Ashgrove okra',
    crop: 'Okra',
    season: '2027',
    design: 'rcbd',
    description: '',
    sowingDate: '',
    transplantDate: '',
    leadEmail: '',
  };

  it('sends blank dates as none and leaves a blank lead out', () => {
    expect(createTrialForm.parse(trial)).toEqual({
      ...trial,
      sowingDate: null,
      transplantDate: null,
      leadEmail: undefined,
    });
  });

  it('keeps transplanting after sowing, in both forms', () => {
    const early = { sowingDate: '2027-05-10', transplantDate: '2027-05-01' };
    expect(problems(createTrialForm.safeParse({ ...trial, ...early }))).toEqual([
      ['transplantDate', 'Transplanting comes after sowing.'],
    ]);
    const { leadEmail: _l, ...settings } = trial;
    expect(
      problems(
        trialSettingsForm.safeParse({
          ...settings,
          ...early,
          fertilizerPolicy: 'as_recorded',
          fertilizerNotes: '',
        }),
      ),
    ).toEqual([['transplantDate', 'Transplanting comes after sowing.']]);
  });
});

describe('the site, trait and planting forms', () => {
  it('reads "Not recorded" as none and refuses coordinates in the region', () => {
    const site = {
      name: 'Quarry Lane',
      region: '',
      soilTexture: '',
      irrigationMethod: '',
      notes: '',
    };
    expect(siteForm.parse(site)).toMatchObject({ soilTexture: null, irrigationMethod: null });
    expect(problems(siteForm.safeParse({ ...site, region: '51.5072, -0.1276' }))).toEqual([
      ['region', 'Give a town or region, not map coordinates.'],
    ]);
  });

  it('makes a trait key from the name and drops the scale of a kind that has none', () => {
    const trait = {
      label: 'Pod length (cm)',
      key: '',
      quantityKind: 'length',
      basis: 'plant',
      direction: 'none',
      scaleMin: '1',
      scaleMax: '5',
    };
    expect(customTraitForm.parse(trait)).toMatchObject({
      key: 'pod_length_cm',
      scaleMin: null,
      scaleMax: null,
      displayUnit: null,
      plausibleMin: null,
    });
    expect(
      problems(customTraitForm.safeParse({ ...trait, quantityKind: 'score', scaleMax: '1' })),
    ).toEqual([
      ['scaleMax', 'A score needs a scale from a lower to a higher number; other kinds have none.'],
    ]);
  });

  it('puts a count problem on its row and field', () => {
    const row = {
      plotId: '5f0c6d2e-8b1a-4c3e-9d7f-1a2b3c4d5e6f',
      plantsSet: '10',
      plantsSurviving: '',
      gaps: '',
      note: '',
    };
    expect(plantingForm.parse({ plots: [row] }).plots[0]).toMatchObject({
      plantsSet: 10,
      plantsSurviving: null,
    });
    expect(
      problems(plantingForm.safeParse({ plots: [row, { ...row, plantsSurviving: '11' }] })),
    ).toEqual([['plots.1.plantsSurviving', 'Survivors cannot outnumber the plants set.']]);
  });
});

describe('the one-day weather form', () => {
  const day = {
    siteId: '5f0c6d2e-8b1a-4c3e-9d7f-1a2b3c4d5e6f',
    date: '2026-10-02',
    tminC: '',
    tmaxC: '',
    rainMm: '',
  };

  it('stores °F and inches as °C and mm, blanks as not read', () => {
    // 50 °F = 10 °C and 86 °F = 30 °C (°C = (°F − 32) × 5/9); 0.5 in = 12.7 mm (NIST SP 811).
    const body = weatherDayForm('us').parse({ ...day, tminC: '50', tmaxC: '86', rainMm: '0,5' });
    expect(body.tminC).toBeCloseTo(10, 9);
    expect(body.tmaxC).toBeCloseTo(30, 9);
    expect(body.rainMm).toBeCloseTo(12.7, 9);
    expect(weatherDayForm('metric').parse({ ...day, rainMm: '4' })).toMatchObject({
      tminC: null,
      tmaxC: null,
      rainMm: 4,
    });
  });

  it('answers with the contract’s messages', () => {
    expect(problems(weatherDayForm('metric').safeParse(day))).toEqual([
      ['tmaxC', 'Enter at least one value.'],
    ]);
    expect(
      problems(
        weatherDayForm('metric').safeParse({ ...day, tminC: '25', tmaxC: '12', rainMm: '-1' }),
      ),
    ).toEqual([
      ['rainMm', 'Rain cannot be below 0.'],
      ['tminC', 'The low is above the high: swap them?'],
    ]);
  });
});

describe('the results sheet form', () => {
  const e1 = '00000000-0000-4000-8000-0000000000e1';
  const e2 = '00000000-0000-4000-8000-0000000000e2';
  const cover = '00000000-0000-4000-8000-0000000000f1';
  const sheet = {
    summary: 'Marrowdale Long led at both gardens.',
    ownMethods: false,
    methods: 'Generated text the lead did not change.',
    traits: [
      { key: 'marketable_mass', basis: 'm2', weight: '2,5' },
      { key: 'plant_height', basis: 'plot', weight: '1' },
    ],
    entryNotes: { [e1]: 'Spines on the stems: wear gloves.', [e2]: '' },
    coverPhotos: { [e1]: '', [e2]: cover },
    alpha: '0.05',
    letters: 'hsd',
    model: '',
    license: 'CC-BY-4.0',
  };

  it('reads the weights and alpha as typed (a decimal comma as a point), blanks as none', () => {
    expect(saveSheetForm.parse(sheet)).toEqual({
      summary: 'Marrowdale Long led at both gardens.',
      methods: null,
      traits: [
        { key: 'marketable_mass', basis: 'm2', weight: 2.5 },
        { key: 'plant_height', basis: 'plot', weight: 1 },
      ],
      entryNotes: { [e1]: 'Spines on the stems: wear gloves.' },
      coverPhotos: { [e2]: cover },
      alpha: 0.05,
      letters: 'hsd',
      model: null,
      license: 'CC-BY-4.0',
    });
    expect(saveSheetForm.parse({ ...sheet, ownMethods: true }).methods).toBe(
      'Generated text the lead did not change.',
    );
  });

  it("answers a weight or alpha out of range with the contract's message on that field", () => {
    const r = saveSheetForm.safeParse({
      ...sheet,
      traits: [
        { key: 'plant_height', basis: 'plot', weight: '12' },
        { ...sheet.traits[0], weight: 'x' },
      ],
      alpha: '0.5',
    });
    expect(problems(r)).toEqual([
      ['traits.0.weight', 'Weights are at most 10.'],
      ['traits.1.weight', 'Enter a weight from 0 to 10.'],
      ['alpha', 'Alpha is less than 0.5.'],
    ]);
    expect(problems(saveSheetForm.safeParse({ ...sheet, traits: [] }))).toEqual([
      ['traits', 'Choose at least one trait.'],
    ]);
  });
});

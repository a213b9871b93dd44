/** The lead's design of a trial: settings, entries, sites, traits, layout, what was planted. */
import { z } from 'zod';
import { calendarDate } from '../calendar-date';
import { type QuantityUnit, toStored } from '../units';
import {
  displayUnitsOfKind,
  entryTypes,
  factorArrangements,
  quantityKinds,
  traitBases,
  traitDirections,
  traitDisplayUnits,
  trialDesigns,
} from './trials';
import { blankAsAbsent, blankAsNull, typedNumber } from './typed-input';

export const soilTextures = [
  'sand',
  'loamy sand',
  'sandy loam',
  'loam',
  'silt loam',
  'silt',
  'sandy clay loam',
  'clay loam',
  'silty clay loam',
  'sandy clay',
  'silty clay',
  'clay',
] as const;
export const irrigationMethods = ['drip', 'overhead', 'furrow', 'hand', 'none'] as const;
export const fertilizerPolicies = ['none_applied', 'per_entry', 'as_recorded'] as const;
export const editableStatuses = ['draft', 'active', 'closed'] as const;

export const fertilizerPolicyLabels: Record<(typeof fertilizerPolicies)[number], string> = {
  none_applied: 'No fertilizer anywhere in the trial',
  per_entry: 'No fertilizer for the entries marked below; the rest as recorded',
  as_recorded: 'Fertilizer as recorded in the field log',
};

/** Largest seed the generator takes (it works on 32-bit integers). */
export const MAX_LAYOUT_SEED = 2_147_483_647;

const text = (max: number, what = 'text') =>
  z.string().trim().max(max, `Use at most ${max} characters for the ${what}.`);
const required = (max: number, what: string) =>
  z
    .string()
    .trim()
    .min(1, `Enter the ${what}.`)
    .max(max, `Use at most ${max} characters for the ${what}.`);
const isoDate = calendarDate();
const lengthMm = (what: string, max = 10_000) =>
  z
    .number(`Enter the ${what} as a number.`)
    .positive(`The ${what} must be more than zero.`)
    .max(max, `The ${what} is longer than this form accepts.`);

export const entryIdParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  entryId: z.uuid('Not an entry id.'),
});
export const siteIdParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  siteId: z.uuid('Not a site id.'),
});
export const traitIdParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  traitId: z.uuid('Not a trait id.'),
});

/* POST /api/trials */
const transplantAfterSowing = (b: { sowingDate?: string | null; transplantDate?: string | null }) =>
  !b.sowingDate || !b.transplantDate || b.transplantDate >= b.sowingDate;
const transplantMessage = {
  path: ['transplantDate'],
  message: 'Transplanting comes after sowing.',
};
const createTrialFields = {
  title: required(200, 'title'),
  crop: required(80, 'crop'),
  season: required(40, 'season'),
  design: z.enum(trialDesigns, 'Choose a design.'),
  description: text(5000, 'description').default(''),
  sowingDate: isoDate.nullable().default(null),
  transplantDate: isoDate.nullable().default(null),
  /** Instance administrators only: the account that will lead the trial. */
  leadEmail: z.email('Enter the lead’s e-mail address.').optional(),
  /** The group the trial belongs to (its coordinators may start trials in it); left out, the
   * first group the lead coordinates, else a group of the lead's own. */
  groupId: z.uuid('Choose a group.').optional(),
};
export const createTrialBody = z
  .object(createTrialFields)
  .refine(transplantAfterSowing, transplantMessage);
export type CreateTrialBody = z.input<typeof createTrialBody>;
/** The new-trial form: dates and the lead's e-mail may be left blank. */
export const createTrialForm = z
  .object({
    ...createTrialFields,
    sowingDate: blankAsNull(createTrialFields.sowingDate),
    transplantDate: blankAsNull(createTrialFields.transplantDate),
    leadEmail: blankAsAbsent(createTrialFields.leadEmail),
    groupId: blankAsAbsent(createTrialFields.groupId),
  })
  .refine(transplantAfterSowing, transplantMessage);
export const createTrialResponse = z.object({ id: z.uuid(), slug: z.string() });

/* POST /api/trials/:slug/copy — next season's trial from this one's design, without records. */
export const copyTrialBody = z.object({
  title: required(200, 'title'),
  season: required(40, 'season'),
});
export type CopyTrialBody = z.input<typeof copyTrialBody>;
export const copyTrialResponse = createTrialResponse.extend({
  /** The copy's group: the source's when the copier may start trials there, else their own. */
  sameGroup: z.boolean(),
  /** The new layout's seed, or null when the trial copied had no layout. */
  seed: z.number().int().nullable(),
});

/* PATCH /api/trials/:slug */
const trialSettingsFields = {
  title: required(200, 'title'),
  crop: required(80, 'crop'),
  season: required(40, 'season'),
  design: z.enum(trialDesigns, 'Choose a design.'),
  status: z.enum(editableStatuses, 'Choose draft, active or closed.'),
  description: text(5000, 'description'),
  sowingDate: isoDate.nullable(),
  transplantDate: isoDate.nullable(),
  fertilizerPolicy: z.enum(fertilizerPolicies, 'Choose a fertilizer policy.'),
  fertilizerNotes: text(2000, 'fertilizer notes'),
};
export const updateTrialBody = z
  .object(trialSettingsFields)
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one setting.');
export type UpdateTrialBody = z.input<typeof updateTrialBody>;
/** The settings form: every setting at once (a published trial's status is not the form's). */
export const trialSettingsForm = z
  .object({
    ...trialSettingsFields,
    status: trialSettingsFields.status.optional(),
    sowingDate: blankAsNull(trialSettingsFields.sowingDate),
    transplantDate: blankAsNull(trialSettingsFields.transplantDate),
  })
  .refine(transplantAfterSowing, transplantMessage);

/* Entries */
const entryFields = {
  name: required(120, 'variety name'),
  code: z
    .string()
    .trim()
    .regex(/^[A-Za-z0-9]{1,6}$/, 'Use 1 to 6 letters or digits for the code.'),
  seedSource: text(200, 'seed source'),
  seedLot: text(80, 'seed lot'),
  entryType: z.enum(entryTypes, 'Choose the type.'),
  daysToMaturityClaimed: z
    .number('Enter the days as a number.')
    .int('Use whole days.')
    .min(1, 'Use 1 to 400 days.')
    .max(400, 'Use 1 to 400 days.')
    .nullable(),
  inRowSpacingMm: lengthMm('in-row spacing').nullable(),
  noFertilizer: z.boolean(),
  notes: text(5000, 'notes'),
  /** The register variety the entry grows; null: the register's variety of the entry's name. */
  varietyId: z.uuid('Choose a variety from the register.').nullable(),
};
export const entryBody = z.object({
  ...entryFields,
  varietyId: entryFields.varietyId.default(null),
  seedSource: entryFields.seedSource.default(''),
  seedLot: entryFields.seedLot.default(''),
  daysToMaturityClaimed: entryFields.daysToMaturityClaimed.default(null),
  inRowSpacingMm: entryFields.inRowSpacingMm.default(null),
  noFertilizer: entryFields.noFertilizer.default(false),
  notes: entryFields.notes.default(''),
});
export type EntryBody = z.input<typeof entryBody>;
/** Only the fields sent change: no defaults here, or a partial edit would blank the rest. */
export const entryUpdateBody = z
  .object(entryFields)
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
/** The entry form: days and spacing may be blank; spacing is typed in `spacingUnit` (cm, in). */
export const entryForm = (spacingUnit: QuantityUnit) =>
  z.object({
    ...entryFields,
    varietyId: blankAsNull(entryFields.varietyId),
    daysToMaturityClaimed: typedNumber(entryFields.daysToMaturityClaimed, { blank: null }),
    inRowSpacingMm: typedNumber(entryFields.inRowSpacingMm, {
      blank: null,
      toStored: (v) => toStored(v, spacingUnit),
    }),
  });

/* Sites: a town or region only, never exact coordinates (sites show on public pages). */
const coordinates = /-?\d{1,3}\.\d{3,}\s*[,;\s]\s*-?\d{1,3}\.\d{3,}|\d+\s*°/;
const siteFields = {
  name: required(120, 'site name'),
  region: text(120, 'town or region').refine(
    (v) => !coordinates.test(v),
    'Give a town or region, not map coordinates.',
  ),
  soilTexture: z.enum(soilTextures, 'Choose a soil textural class.').nullable(),
  irrigationMethod: z.enum(irrigationMethods, 'Choose an irrigation method.').nullable(),
  notes: text(5000, 'notes').refine(
    (v) => !coordinates.test(v),
    'Leave map coordinates out of the notes.',
  ),
};
export const siteBody = z.object({
  ...siteFields,
  region: siteFields.region.default(''),
  soilTexture: siteFields.soilTexture.default(null),
  irrigationMethod: siteFields.irrigationMethod.default(null),
  notes: siteFields.notes.default(''),
});
export type SiteBody = z.input<typeof siteBody>;
export const siteUpdateBody = z
  .object(siteFields)
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
/** The site form: "Not recorded" is a blank choice. */
export const siteForm = z.object({
  ...siteFields,
  soilTexture: blankAsNull(siteFields.soilTexture),
  irrigationMethod: blankAsNull(siteFields.irrigationMethod),
});

/* Traits */
const traitFields = {
  key: z
    .string()
    .trim()
    .regex(
      /^[a-z][a-z0-9_]{0,39}$/,
      'Use a short key of lower-case letters, digits and _ , starting with a letter.',
    ),
  label: required(120, 'trait name'),
  quantityKind: z.enum(quantityKinds, 'Choose what is measured.'),
  basis: z.enum(traitBases, 'Choose per plant, per plot or per harvest.'),
  direction: z.enum(traitDirections, 'Choose which direction is better.'),
  scaleMin: z.number('Enter the lowest score as a number.').finite().nullable(),
  scaleMax: z.number('Enter the highest score as a number.').finite().nullable(),
  sortOrder: z.number().int().min(0).max(999),
  /** null: the unit is chosen from the kind (common/display-units.ts). */
  displayUnit: z.enum(traitDisplayUnits, 'Choose a unit.').nullable(),
  /** In stored units (g, mm); a harvest mass per fruit, a harvest count per harvest. */
  plausibleMin: z.number('Enter the lowest plausible value as a number.').finite().nullable(),
  plausibleMax: z.number('Enter the highest plausible value as a number.').finite().nullable(),
};

/** The settings of a trait that its rules look at together (after an edit, the merged ones). */
export interface TraitRuleFields {
  quantityKind?: string;
  scaleMin?: number | null;
  scaleMax?: number | null;
  displayUnit?: string | null;
  plausibleMin?: number | null;
  plausibleMax?: number | null;
}

/** A lead's unit must measure what the trait records: cm for a length, kg for a mass. */
export function unitFitsKind(b: TraitRuleFields) {
  if (b.displayUnit == null || b.quantityKind === undefined) return true;
  const fits = displayUnitsOfKind[b.quantityKind as keyof typeof displayUnitsOfKind] as
    readonly string[] | undefined;
  return fits?.includes(b.displayUnit) ?? false;
}
export const unitMessage = {
  path: ['displayUnit'],
  message: 'Only a length or a mass has a unit to choose, and it must measure that quantity.',
};

/** A plausible range runs from a lower to a higher value; dates and scores have none. */
export function rangeRule(b: TraitRuleFields) {
  if (b.plausibleMin == null && b.plausibleMax == null) return true;
  if (b.quantityKind === 'score' || b.quantityKind === 'date') return false;
  return b.plausibleMin == null || b.plausibleMax == null || b.plausibleMin < b.plausibleMax;
}
export const rangeMessage = {
  path: ['plausibleMax'],
  message:
    'The plausible range runs from a lower to a higher value (a score has its scale, a date none).',
};

export function scaleRule(b: TraitRuleFields) {
  if (b.quantityKind === undefined) return true;
  if (b.quantityKind === 'score')
    return b.scaleMin != null && b.scaleMax != null && b.scaleMin < b.scaleMax;
  return b.scaleMin == null && b.scaleMax == null;
}
export const scaleMessage = {
  path: ['scaleMax'],
  message: 'A score needs a scale from a lower to a higher number; other kinds have none.',
};
export const traitBody = z
  .object({
    ...traitFields,
    scaleMin: traitFields.scaleMin.default(null),
    scaleMax: traitFields.scaleMax.default(null),
    sortOrder: traitFields.sortOrder.optional(),
    displayUnit: traitFields.displayUnit.default(null),
    plausibleMin: traitFields.plausibleMin.default(null),
    plausibleMax: traitFields.plausibleMax.default(null),
  })
  .refine(scaleRule, scaleMessage)
  .refine(unitFitsKind, unitMessage)
  .refine(rangeRule, rangeMessage);
export type TraitBody = z.input<typeof traitBody>;
/** A short key for exported files from a trait's name: "Pod length (cm)" → pod_length_cm. */
export const traitKeyFrom = (label: string) =>
  label
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .replace(/^([0-9])/, 't_$1')
    .slice(0, 40);
/** The custom-trait form: the key is made from the name when left blank; scales only for scores. */
export const customTraitForm = z
  .object({
    ...traitFields,
    key: blankAsAbsent(traitFields.key.optional()),
    scaleMin: typedNumber(traitFields.scaleMin, { blank: null }),
    scaleMax: typedNumber(traitFields.scaleMax, { blank: null }),
    sortOrder: traitFields.sortOrder.optional(),
    displayUnit: blankAsNull(traitFields.displayUnit.default(null)),
    plausibleMin: typedNumber(traitFields.plausibleMin.default(null), { blank: null }),
    plausibleMax: typedNumber(traitFields.plausibleMax.default(null), { blank: null }),
  })
  .transform(({ key, ...b }) => ({
    ...b,
    key: key ?? traitKeyFrom(b.label),
    ...(b.quantityKind === 'score' ? {} : { scaleMin: null, scaleMax: null }),
  }))
  .refine(scaleRule, scaleMessage)
  .refine(unitFitsKind, unitMessage)
  .refine(rangeRule, rangeMessage);
export const traitUpdateBody = z
  .object(traitFields)
  .partial()
  .refine(scaleRule, scaleMessage)
  .refine(unitFitsKind, unitMessage)
  .refine(rangeRule, rangeMessage)
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type TraitUpdateBody = z.input<typeof traitUpdateBody>;

/**
 * The trait edit form: name, direction, basis, the lead's unit and the plausible range. The range
 * is typed in `rangeUnit` (cm for a height, g per fruit for a harvest mass) and sent stored (mm, g);
 * a blank end has no limit. Key, kind and scale are not offered: they stay once records use them.
 */
export const traitEditForm = (
  quantityKind: (typeof quantityKinds)[number],
  rangeUnit: QuantityUnit | null,
) => {
  const range = <T extends z.ZodType>(schema: T) =>
    typedNumber(schema, {
      blank: null,
      toStored: rangeUnit ? (v) => toStored(v, rangeUnit) : undefined,
    });
  return z
    .object({
      label: traitFields.label,
      direction: traitFields.direction,
      basis: traitFields.basis,
      displayUnit: blankAsNull(traitFields.displayUnit),
      plausibleMin: range(traitFields.plausibleMin),
      plausibleMax: range(traitFields.plausibleMax),
    })
    .refine((b) => unitFitsKind({ ...b, quantityKind }), unitMessage)
    .refine((b) => rangeRule({ ...b, quantityKind }), rangeMessage);
};

/* PATCH /api/trials/:slug/traits/:traitId answers what the edit means for the public sheet. */
export const traitUpdateResponse = z.object({
  /** The newest published version, which keeps showing the trait as it was. */
  publishedVersion: z.number().int().nullable(),
  /** True when the edit changes what a new version would show (names, units, ranks). */
  altersPublished: z.boolean(),
});
export type TraitUpdateResponse = z.infer<typeof traitUpdateResponse>;

/* POST /api/trials/:slug/layout */
/** A second factor's levels: the lead's order, 2 to 6 distinct names. */
const factorLevelsField = z
  .array(required(40, 'treatment level'))
  .max(6, 'Use at most 6 treatment levels.')
  .refine(
    (l) => new Set(l.map((x) => x.toLowerCase())).size === l.length,
    'Give each treatment level its own name.',
  );
/** Named ⇔ levels: a blank name with no levels is a one-factor trial. */
const factorComplete = (b: { factorName: string; factorLevels: string[] }) =>
  b.factorName === '' ? b.factorLevels.length === 0 : b.factorLevels.length >= 2;
const factorMessage = {
  path: ['factorLevels'],
  message: 'Name the treatment and give it at least two levels, or leave both blank.',
};
const layoutFields = z.object({
  replicates: z
    .number('Enter the number of replicates.')
    .int('Use a whole number of replicates.')
    .min(1, 'Use 1 to 99 replicates.')
    .max(99, 'Use 1 to 99 replicates.'),
  /** Omit for a fresh random seed; give one to reproduce a layout. */
  seed: z
    .number()
    .int('The seed is a whole number.')
    .min(0, `Use a seed from 0 to ${MAX_LAYOUT_SEED}.`)
    .max(MAX_LAYOUT_SEED, `Use a seed from 0 to ${MAX_LAYOUT_SEED}.`)
    .optional(),
  rowsPerPlot: z.number().int().min(1, 'Use 1 to 12 rows.').max(12, 'Use 1 to 12 rows.').default(1),
  rowLengthMm: lengthMm('row length', 1_000_000),
  rowSpacingMm: lengthMm('between-row spacing'),
  /** For entries without a spacing of their own. */
  inRowSpacingMm: lengthMm('in-row spacing').nullable().default(null),
  /** The second factor (a treatment such as fertilizer); blank for a one-factor trial. */
  factorName: text(60, 'treatment name').default(''),
  factorLevels: factorLevelsField.default([]),
  factorArrangement: z
    .enum(factorArrangements, 'Choose factorial or split plot.')
    .default('factorial'),
  /** Incomplete blocks: entries per block; a network: entries each garden grows. */
  blockSize: z
    .number('Enter how many entries a block holds.')
    .int('Use a whole number of entries.')
    .min(2, 'A block holds at least 2 entries.')
    .max(999, 'A block holds at most 999 entries.')
    .nullable()
    .default(null),
});
export const layoutBody = layoutFields.refine(factorComplete, factorMessage);
export type LayoutBody = z.input<typeof layoutBody>;
/** The layout form: lengths typed in the units shown beside them; a blank seed draws a new one. */
export const layoutForm = (units: { rowLength: QuantityUnit; spacing: QuantityUnit }) => {
  const f = layoutFields.shape;
  const length = <T extends z.ZodType>(schema: T, unit: QuantityUnit, blank?: null) =>
    typedNumber(schema, { blank, toStored: (v) => toStored(v, unit) });
  return z
    .object({
      replicates: typedNumber(f.replicates),
      seed: typedNumber(f.seed),
      rowsPerPlot: typedNumber(f.rowsPerPlot),
      rowLengthMm: length(f.rowLengthMm, units.rowLength),
      rowSpacingMm: length(f.rowSpacingMm, units.spacing),
      inRowSpacingMm: length(f.inRowSpacingMm, units.spacing, null),
      factorName: f.factorName,
      /** Typed one per line (or separated by commas). */
      factorLevels: z.preprocess(
        (v) =>
          typeof v === 'string'
            ? v
                .split(/[\n,]/)
                .map((x) => x.trim())
                .filter(Boolean)
            : v,
        f.factorLevels,
      ),
      factorArrangement: f.factorArrangement,
      blockSize: typedNumber(f.blockSize, { blank: null }),
    })
    .refine(factorComplete, factorMessage);
};

/* PUT /api/trials/:slug/layout/planting */
const count = (what: string) =>
  z
    .number(`Enter the ${what} as a number.`)
    .int(`Count whole plants for the ${what}.`)
    .min(0, `The ${what} cannot be negative.`)
    .max(100_000, `The ${what} is more than this form accepts.`)
    .nullable();
const plantingRowFields = {
  plotId: z.uuid('Not a plot id.'),
  plantsSet: count('plants set'),
  plantsSurviving: count('survivors'),
  gaps: count('gaps'),
  note: text(2000, 'note').default(''),
};
type PlantingCounts = {
  plantsSet: number | null;
  plantsSurviving: number | null;
  gaps: number | null;
};
const plantingRules = <T extends z.ZodType<PlantingCounts>>(row: T) =>
  row
    .refine(
      (r) => r.plantsSurviving == null || r.plantsSet == null || r.plantsSurviving <= r.plantsSet,
      { path: ['plantsSurviving'], message: 'Survivors cannot outnumber the plants set.' },
    )
    .refine((r) => r.gaps == null || r.plantsSet == null || r.gaps <= r.plantsSet, {
      path: ['gaps'],
      message: 'Gaps cannot outnumber the plants set.',
    });
export const plantingRow = plantingRules(z.object(plantingRowFields));
export const plantingBody = z.object({
  plots: z.array(plantingRow).min(1, 'Send at least one plot.').max(5000),
});
/** The planting table: one row of typed counts per plot, blank for "not counted". */
export const plantingForm = z.object({
  plots: z.array(
    plantingRules(
      z.object({
        ...plantingRowFields,
        plantsSet: typedNumber(plantingRowFields.plantsSet, { blank: null }),
        plantsSurviving: typedNumber(plantingRowFields.plantsSurviving, { blank: null }),
        gaps: typedNumber(plantingRowFields.gaps, { blank: null }),
      }),
    ),
  ),
});
export type PlantingBody = z.input<typeof plantingBody>;
export const plantingResponse = z.object({ updated: z.number().int() });

/* GET /api/trials/:slug/design */
export const designEntrySchema = z.object({
  id: z.uuid(),
  name: z.string(),
  code: z.string(),
  seedSource: z.string(),
  seedLot: z.string(),
  entryType: z.enum(entryTypes),
  daysToMaturityClaimed: z.number().int().nullable(),
  inRowSpacingMm: z.number().nullable(),
  noFertilizer: z.boolean(),
  notes: z.string(),
  /** The register variety the entry grows (its page is /varieties/<slug>). */
  variety: z.object({ id: z.uuid(), slug: z.string(), name: z.string() }).nullable(),
});
export type DesignEntry = z.infer<typeof designEntrySchema>;
export const designSiteSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  region: z.string(),
  soilTexture: z.enum(soilTextures).nullable(),
  irrigationMethod: z.enum(irrigationMethods).nullable(),
  notes: z.string(),
});
export type DesignSite = z.infer<typeof designSiteSchema>;
export const designTraitSchema = z.object({
  id: z.uuid(),
  key: z.string(),
  label: z.string(),
  quantityKind: z.enum(quantityKinds),
  basis: z.enum(traitBases),
  direction: z.enum(traitDirections),
  scaleMin: z.number().nullable(),
  scaleMax: z.number().nullable(),
  sortOrder: z.number().int(),
  displayUnit: z.enum(traitDisplayUnits).nullable(),
  plausibleMin: z.number().nullable(),
  plausibleMax: z.number().nullable(),
  observationCount: z.number().int(),
});
export type DesignTrait = z.infer<typeof designTraitSchema>;
export const designPlotSchema = z.object({
  id: z.uuid(),
  siteId: z.uuid(),
  entryId: z.uuid(),
  block: z.number().int(),
  position: z.number().int(),
  plotNumber: z.number().int(),
  /** Incomplete blocks and networks: the replicate the plot's block (or garden) belongs to. */
  replicate: z.number().int().nullable(),
  inRowSpacingMm: z.number().nullable(),
  rowLengthMm: z.number().nullable(),
  rowSpacingMm: z.number().nullable(),
  /** From row length and spacing (common/planting.ts); null when either is missing. */
  plannedPlants: z.number().int().nullable(),
  plantsSet: z.number().int().nullable(),
  plantsSurviving: z.number().int().nullable(),
  gaps: z.number().int().nullable(),
  plantedNote: z.string(),
  /** The plot's level of the second factor; null in a one-factor trial. */
  treatment: z.string().nullable(),
});
export type DesignPlot = z.infer<typeof designPlotSchema>;

/** What an incomplete-block plan gives: how evenly entries meet in blocks. */
export const incompleteBlocksSummary = z.object({
  /** Blocks (gardens for a network) in all, and full replicates among them. */
  blocks: z.number().int(),
  fullReplicates: z.number().int(),
  /** Smallest and largest block. */
  smallestBlock: z.number().int(),
  largestBlock: z.number().int(),
  /** Fewest and most blocks that any two entries share. */
  concurrenceMin: z.number().int(),
  concurrenceMax: z.number().int(),
  /** Pairs of entries that share a block 0, 1, 2 … times. */
  concurrenceCounts: z.array(z.number().int()),
  /** Plots per entry, fewest and most. */
  replicationMin: z.number().int(),
  replicationMax: z.number().int(),
  /** Efficiency factor of the intra-block analysis (null when replication is unequal). */
  efficiency: z.number().nullable(),
});
export type IncompleteBlocksSummary = z.infer<typeof incompleteBlocksSummary>;

export const designSchema = z.object({
  id: z.uuid(),
  slug: z.string(),
  title: z.string(),
  crop: z.string(),
  season: z.string(),
  design: z.enum(trialDesigns),
  status: z.enum(['draft', 'active', 'closed', 'published']),
  description: z.string(),
  sowingDate: z.string().nullable(),
  transplantDate: z.string().nullable(),
  fertilizerPolicy: z.enum(fertilizerPolicies),
  fertilizerNotes: z.string(),
  canEdit: z.boolean(),
  /** The second factor (a treatment compared across the varieties), or null. */
  factor: z
    .object({
      name: z.string(),
      levels: z.array(z.string()),
      arrangement: z.enum(factorArrangements),
    })
    .nullable(),
  layout: z.object({
    seed: z.number().int().nullable(),
    replicates: z.number().int().nullable(),
    rowsPerPlot: z.number().int(),
    rowLengthMm: z.number().nullable(),
    rowSpacingMm: z.number().nullable(),
    inRowSpacingMm: z.number().nullable(),
    generatedAt: z.string().nullable(),
    /** Once any record refers to a plot, the layout cannot change. */
    locked: z.boolean(),
    lockedReason: z.string().nullable(),
    /** Incomplete blocks: entries per block; a network: entries per garden. */
    blockSize: z.number().int().nullable(),
    /** The laid-out plan's blocks, for incomplete-block designs (null otherwise or before a layout). */
    blocks: incompleteBlocksSummary.nullable(),
  }),
  entries: z.array(designEntrySchema),
  /** The trial's group's register, for the lead to pick an entry's variety from (others: empty). */
  register: z.array(z.object({ id: z.uuid(), slug: z.string(), name: z.string() })),
  sites: z.array(designSiteSchema),
  traits: z.array(designTraitSchema),
  plots: z.array(designPlotSchema),
});
export type Design = z.infer<typeof designSchema>;

/**
 * Field records: harvests, observations (measurements, scores, dates), field events, stand
 * counts, CSV import and export, completeness and the audit log. One schema per endpoint, used
 * by the server to parse and by the client to build requests and read answers.
 */
import { z } from 'zod';
import { calendarDate, latestRecordDate } from '../calendar-date';
import { G_PER_POUND, toStored, type UnitSystem } from '../units';
import {
  gallonsToLitres,
  gphPer100FtToLPerHPerM,
  inchesPerHourToMmPerHour,
  squareFeetToSquareMetres,
} from '../water';
import { readTypedNumber, typedNumber } from './typed-input';

export const harvestGrades = ['marketable', 'cull'] as const;
export const fieldEventKinds = [
  'irrigation',
  'rainfall',
  'fertilizer',
  'thinning',
  'pruning',
  'transplanting',
  'note',
] as const;
export type FieldEventKind = (typeof fieldEventKinds)[number];
export const irrigationMethods = ['drip', 'overhead', 'hand'] as const;
/** The kinds of field record, each its own table. */
export const recordTables = ['harvests', 'observations', 'field_events'] as const;
export type RecordTable = (typeof recordTables)[number];
/** What the audit log follows: every record, a plot's stand count and the lead's trait edits. */
export const auditTables = [...recordTables, 'plots', 'traits'] as const;
export type AuditTableName = (typeof auditTables)[number];
export const restorableTables = recordTables;
export const auditActions = ['create', 'update', 'delete', 'restore'] as const;

const isoDate = calendarDate();

/** A field date: real, not before 1900, and not in the future. */
export const fieldDate = isoDate
  .refine((s) => s >= '1900-01-01', 'The date is too far in the past.')
  .refine((s) => s <= latestRecordDate(), 'The date is in the future.');

const noteText = z.string().trim().max(2000, 'Use at most 2000 characters.');
const note = noteText.default('');
const finite = (what: string) =>
  z
    .number({ error: `${what} must be a number.` })
    .refine(Number.isFinite, `${what} must be a number.`);
const nonNegative = (what: string, max: number) =>
  finite(what)
    .refine((v) => v >= 0, `${what} cannot be negative.`)
    .refine((v) => v <= max, `${what} is implausibly large.`);
const positive = (what: string, max: number) =>
  finite(what)
    .refine((v) => v > 0, `${what} must be above 0.`)
    .refine((v) => v <= max, `${what} is implausibly large.`);
const count = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a whole number.` })
    .int(`${what} must be a whole number.`)
    .min(0, `${what} cannot be negative.`)
    .max(max, `${what} is implausibly large.`);

export const recordParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  id: z.uuid('Not a record id.'),
});
export const slugParams = recordParams.pick({ slug: true });

const recordMeta = {
  id: z.uuid(),
  version: z.number().int(),
  deletedAt: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  createdByName: z.string().nullable(),
  updatedByName: z.string().nullable(),
};
const plotRef = {
  plotId: z.uuid(),
  siteId: z.uuid(),
  siteName: z.string(),
  plotNumber: z.number().int(),
  block: z.number().int(),
  entryId: z.uuid(),
  entryCode: z.string(),
  entryName: z.string(),
  /** a two-factor trial's plot: its level of the treatment (null or absent for one factor) */
  treatment: z.string().nullable().optional(),
};

/** A 409 answer's details: the record as stored now and which fields differ. */
export const conflictDetailsSchema = z.object({
  current: z.record(z.string(), z.unknown()),
  changedFields: z.array(z.string()),
  yourVersion: z.number().int(),
  currentVersion: z.number().int(),
});
export type ConflictDetails = z.infer<typeof conflictDetailsSchema>;

export const listQuery = z.object({
  siteId: z.uuid('Not a site id.').optional(),
  plotId: z.uuid('Not a plot id.').optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  includeDeleted: z.enum(['true', 'false']).optional(),
});

/** The most rows one page of a record log carries. */
export const maxLogPageSize = 200;
/** Rows a log page carries when the request does not say. */
export const defaultLogPageSize = 50;

/** What a record log can be sorted by, across every page (the server sorts). */
export const logSortKeys = ['date', 'plot', 'entry'] as const;
export type LogSortKey = (typeof logSortKeys)[number];
export const sortOrders = ['asc', 'desc'] as const;

/**
 * A page of a record log: site, date range and a search over the entry, site, plot and note;
 * sorted by `sort` (newest first by default; plot and entry from the lowest unless `order`
 * says), then `page` (from 1) of `limit` rows.
 */
const logPageQuery = listQuery.extend({
  q: z.string().trim().max(100, 'Search for at most 100 characters.').optional(),
  sort: z.enum(logSortKeys, { error: 'Sort by date, plot or entry.' }).default('date'),
  order: z.enum(sortOrders, { error: 'Sort ascending (asc) or descending (desc).' }).optional(),
  page: z.coerce
    .number({ error: 'The page is a whole number from 1.' })
    .int('The page is a whole number from 1.')
    .min(1, 'The page is a whole number from 1.')
    .max(100_000, 'There are not that many pages.')
    .default(1),
  limit: z.coerce
    .number({ error: `Ask for 1 to ${maxLogPageSize} rows a page.` })
    .int(`Ask for 1 to ${maxLogPageSize} rows a page.`)
    .min(1, `Ask for 1 to ${maxLogPageSize} rows a page.`)
    .max(maxLogPageSize, `Ask for 1 to ${maxLogPageSize} rows a page.`)
    .default(defaultLogPageSize),
});
const fromNotAfterTo = <T extends { from?: string; to?: string }>(q: T) =>
  q.from === undefined || q.to === undefined || q.from <= q.to;
const dateRangeIssue = { message: 'The range starts after it ends.', path: ['from'] };

/** Where a log page stands in the whole filtered list. */
const pageMeta = {
  page: z.number().int(),
  limit: z.number().int(),
  /** rows that match the filters, on every page */
  total: z.number().int(),
};

// ---------- Harvests ----------

export const harvestSchema = z.object({
  ...recordMeta,
  ...plotRef,
  harvestedOn: z.string(),
  fruitCount: z.number().int(),
  massG: z.number(),
  grade: z.enum(harvestGrades),
  note: z.string(),
});
export type Harvest = z.infer<typeof harvestSchema>;

const harvestFields = {
  harvestedOn: fieldDate,
  fruitCount: count('Fruit count', 100_000),
  massG: nonNegative('Mass', 10_000_000),
  grade: z.enum(harvestGrades, { error: 'Choose marketable or cull.' }),
};
/** POST /api/trials/:slug/harvests — the id is made on the device, so a retry is the same record. */
export const createHarvestBody = z.object({
  id: z.uuid(),
  plotId: z.uuid(),
  ...harvestFields,
  note,
});
export type CreateHarvestBody = z.input<typeof createHarvestBody>;
/** PATCH /api/trials/:slug/harvests/:id — carries the version it was read at. */
export const updateHarvestBody = z
  .object({ ...harvestFields, note: noteText })
  .partial()
  .extend({ version: z.number().int().min(1) });
export type UpdateHarvestBody = z.input<typeof updateHarvestBody>;
/** GET /api/trials/:slug/harvests — a page of the harvest log. */
export const harvestLogQuery = logPageQuery
  .extend({ grade: z.enum(harvestGrades, { error: 'Choose marketable or cull.' }).optional() })
  .refine(fromNotAfterTo, dateRangeIssue);
export type HarvestLogQuery = z.input<typeof harvestLogQuery>;
export const harvestListSchema = z.object({
  harvests: z.array(harvestSchema),
  ...pageMeta,
  /** the mass of every matching harvest, on every page */
  totalMassG: z.number(),
});
export type HarvestList = z.infer<typeof harvestListSchema>;

// ---------- Observations ----------

export const observationSchema = z.object({
  ...recordMeta,
  ...plotRef,
  traitId: z.uuid(),
  traitKey: z.string(),
  traitLabel: z.string(),
  observedOn: z.string(),
  value: z.number().nullable(),
  valueDate: z.string().nullable(),
  plantNumber: z.number().int().nullable(),
  note: z.string(),
});
export type Observation = z.infer<typeof observationSchema>;

const plantNumber = z
  .number()
  .int('Plant number must be a whole number.')
  .min(1, 'Plant numbers start at 1.')
  .max(999, 'Plant numbers go up to 999.')
  .nullable();
const observationFields = {
  observedOn: fieldDate,
  value: finite('Value').nullable().default(null),
  valueDate: fieldDate.nullable().default(null),
  plantNumber: plantNumber.default(null),
  note,
};
export const createObservationBody = z
  .object({ id: z.uuid(), plotId: z.uuid(), traitId: z.uuid(), ...observationFields })
  .refine((o) => (o.value === null) !== (o.valueDate === null), {
    message: 'Give either a value or a date.',
    path: ['value'],
  });
export type CreateObservationBody = z.input<typeof createObservationBody>;
export const updateObservationBody = z
  .object({
    observedOn: fieldDate,
    value: finite('Value').nullable(),
    valueDate: fieldDate.nullable(),
    plantNumber,
    note: noteText,
  })
  .partial()
  .extend({ version: z.number().int().min(1) });
export type UpdateObservationBody = z.input<typeof updateObservationBody>;
/** GET /api/trials/:slug/observations — a page of the observation log. */
export const observationLogQuery = logPageQuery
  .extend({ traitId: z.uuid('Not a trait id.').optional() })
  .refine(fromNotAfterTo, dateRangeIssue);
export type ObservationLogQuery = z.input<typeof observationLogQuery>;
export const observationListSchema = z.object({
  observations: z.array(observationSchema),
  ...pageMeta,
});
export type ObservationList = z.infer<typeof observationListSchema>;

// ---------- Field events ----------

const eventFields = {
  occurredOn: fieldDate,
  note,
  irrigationMethod: z.enum(irrigationMethods).nullable().default(null),
  runTimeMin: positive('Run time', 7 * 24 * 60)
    .nullable()
    .default(null),
  dripEmitterFlowLPerH: positive('Emitter flow', 1000).nullable().default(null),
  dripEmitterSpacingMm: positive('Emitter spacing', 10_000).nullable().default(null),
  dripLineFlowLPerHPerM: positive('Line flow', 1000).nullable().default(null),
  wettedWidthMm: positive('Wetted width', 10_000).nullable().default(null),
  sprinklerRateMmPerH: positive('Sprinkler rate', 500).nullable().default(null),
  handVolumeL: positive('Volume', 100_000).nullable().default(null),
  wettedAreaM2: positive('Wetted area', 100_000).nullable().default(null),
  rainMm: nonNegative('Rain', 1000).nullable().default(null),
  amendmentKind: z.string().trim().max(120, 'Use at most 120 characters.').nullable().default(null),
  rateGPerM2: nonNegative('Rate', 100_000).nullable().default(null),
  noneApplied: z.boolean().default(false),
  targetSpacingMm: positive('Target spacing', 10_000).nullable().default(null),
};
const eventShape = z.object({
  kind: z.enum(fieldEventKinds, { error: 'Choose what happened.' }),
  ...eventFields,
});
export type FieldEventInput = z.output<typeof eventShape>;
/** An event's details without its date, as the field-event form gives them. */
type EventDetails = Omit<FieldEventInput, 'occurredOn'>;

/** What each kind of event must carry; shared by create, update and the field-event form. */
export function fieldEventProblems(e: EventDetails): { path: string; message: string }[] {
  const out: { path: string; message: string }[] = [];
  const need = (path: keyof EventDetails, message: string) => {
    if (e[path] === null || e[path] === '') out.push({ path, message });
  };
  if (e.kind === 'irrigation') {
    need('irrigationMethod', 'Choose drip, overhead sprinkler or hand watering.');
    need('runTimeMin', 'Enter how long the water ran.');
    if (e.irrigationMethod === 'drip') {
      need('wettedWidthMm', 'Enter the width of soil the drip line wets.');
      if (e.dripLineFlowLPerHPerM === null) {
        need('dripEmitterFlowLPerH', 'Enter the emitter flow, or the line flow per length.');
        need('dripEmitterSpacingMm', 'Enter the emitter spacing, or the line flow per length.');
      }
    }
    if (e.irrigationMethod === 'overhead')
      need('sprinklerRateMmPerH', 'Enter the sprinkler precipitation rate.');
    if (e.irrigationMethod === 'hand') {
      need('handVolumeL', 'Enter how much water was applied.');
      need('wettedAreaM2', 'Enter the area watered.');
    }
  }
  if (e.kind === 'rainfall') need('rainMm', 'Enter the rain gauge reading.');
  if (e.kind === 'fertilizer' && !e.noneApplied) {
    need('amendmentKind', 'Enter what was applied, or mark "none applied".');
    need('rateGPerM2', 'Enter the rate applied, or mark "none applied".');
  }
  if (e.kind === 'thinning') need('targetSpacingMm', 'Enter the spacing thinned to.');
  if (e.kind === 'note' && !e.note) out.push({ path: 'note', message: 'Write the note.' });
  return out;
}

function checkEvent(e: EventDetails, ctx: z.RefinementCtx) {
  for (const p of fieldEventProblems(e))
    ctx.addIssue({ code: 'custom', path: [p.path], message: p.message });
}

export const createFieldEventBody = eventShape
  .extend({ id: z.uuid(), siteId: z.uuid(), plotId: z.uuid().nullable().default(null) })
  .superRefine(checkEvent);
export type CreateFieldEventBody = z.input<typeof createFieldEventBody>;
/** PATCH replaces the event's details (kind, site and plot stay); the depth is recomputed. */
export const updateFieldEventBody = z.object({ version: z.number().int().min(1), ...eventFields });
export type UpdateFieldEventBody = z.input<typeof updateFieldEventBody>;

export const fieldEventSchema = z.object({
  ...recordMeta,
  siteId: z.uuid(),
  siteName: z.string(),
  plotId: z.uuid().nullable(),
  plotNumber: z.number().int().nullable(),
  kind: z.enum(fieldEventKinds),
  occurredOn: z.string(),
  irrigationMethod: z.string().nullable(),
  runTimeMin: z.number().nullable(),
  waterDepthMm: z.number().nullable(),
  dripEmitterFlowLPerH: z.number().nullable(),
  dripEmitterSpacingMm: z.number().nullable(),
  dripLineFlowLPerHPerM: z.number().nullable(),
  wettedWidthMm: z.number().nullable(),
  sprinklerRateMmPerH: z.number().nullable(),
  handVolumeL: z.number().nullable(),
  wettedAreaM2: z.number().nullable(),
  rainMm: z.number().nullable(),
  amendmentKind: z.string().nullable(),
  rateGPerM2: z.number().nullable(),
  noneApplied: z.boolean(),
  targetSpacingMm: z.number().nullable(),
  note: z.string(),
});
export type FieldEvent = z.infer<typeof fieldEventSchema>;
export const fieldEventListSchema = z.object({ events: z.array(fieldEventSchema) });

// ---------- Plots, stand counts, completeness ----------

export const recordPlotSchema = z.object({
  ...plotRef,
  position: z.number().int(),
  plantsSet: z.number().int().nullable(),
  plantsSurviving: z.number().int().nullable(),
});
export type RecordPlot = z.infer<typeof recordPlotSchema>;
export const recordPlotListSchema = z.object({ plots: z.array(recordPlotSchema) });

export const plotParams = z.object({
  slug: slugParams.shape.slug,
  plotId: z.uuid('Not a plot id.'),
});
/** PUT /api/trials/:slug/records/plots/:plotId/stand-count — plants standing now. */
export const standCountBody = z.object({ plantsSurviving: count('Stand count', 100_000) });
export type StandCountBody = z.input<typeof standCountBody>;

export const completenessQuery = z.object({
  siteId: z.uuid().optional(),
  from: isoDate,
  to: isoDate,
});
export const completenessSchema = z.object({
  from: z.string(),
  to: z.string(),
  traits: z.array(
    z.object({ id: z.uuid(), key: z.string(), label: z.string(), basis: z.string() }),
  ),
  plots: z.array(recordPlotSchema),
  /** observations per plot and trait in the round; plots with none are missing */
  cells: z.array(z.object({ plotId: z.uuid(), traitId: z.uuid(), count: z.number().int() })),
  harvests: z.array(z.object({ plotId: z.uuid(), count: z.number().int() })),
});
export type Completeness = z.infer<typeof completenessSchema>;

// ---------- Undo and restore ----------

export const restoreBody = z.object({
  table: z.enum(restorableTables, { error: 'Choose harvests, observations or field_events.' }),
  recordId: z.uuid('Not a record id.'),
});
export type RestoreBody = z.input<typeof restoreBody>;
export const restoredSchema = z.object({
  table: z.enum(restorableTables),
  recordId: z.uuid(),
  version: z.number().int(),
});

// ---------- Audit log ----------

export const auditQuery = z.object({
  table: z.enum(auditTables).optional(),
  recordId: z.uuid().optional(),
  action: z.enum(auditActions).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  beforeId: z.coerce.number().int().min(1).optional(),
});
export const auditEntrySchema = z.object({
  id: z.number().int(),
  table: z.enum(auditTables),
  recordId: z.uuid(),
  action: z.enum(auditActions),
  before: z.record(z.string(), z.unknown()).nullable(),
  after: z.record(z.string(), z.unknown()),
  changedFields: z.array(z.string()),
  actorId: z.string().nullable(),
  actorName: z.string().nullable(),
  at: z.string(),
  /** the record is deleted now and this is its latest deletion */
  restorable: z.boolean(),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;
export const auditListSchema = z.object({
  entries: z.array(auditEntrySchema),
  nextBeforeId: z.number().int().nullable(),
});

// ---------- CSV import and export ----------

/** A recording sheet ("sheet") carries harvests and observations of one round, a plot a row. */
export const importKinds = ['harvests', 'observations', 'sheet'] as const;
export type ImportKind = (typeof importKinds)[number];
export const importBody = z.object({
  kind: z.enum(importKinds, { error: 'Choose harvests, observations or a recording sheet.' }),
  csv: z
    .string()
    .min(1, 'The file is empty.')
    .max(900_000, 'The file is larger than 900 kB: split it.'),
});
export type ImportBody = z.input<typeof importBody>;
export const importRowErrorSchema = z.object({
  row: z.number().int(),
  column: z.string(),
  message: z.string(),
});
export type ImportRowError = z.infer<typeof importRowErrorSchema>;
/** What a row of an import would record, in stored units (the reader's units are the client's). */
export const importedRecordSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('harvest'),
    date: z.string(),
    fruitCount: z.number().int(),
    massG: z.number(),
    grade: z.enum(harvestGrades),
  }),
  z.object({
    kind: z.literal('observation'),
    date: z.string(),
    traitKey: z.string(),
    traitLabel: z.string(),
    plantNumber: z.number().int().nullable(),
    value: z.number().nullable(),
    valueDate: z.string().nullable(),
  }),
]);
export type ImportedRecord = z.infer<typeof importedRecordSchema>;
export const importPreviewSchema = z.object({
  kind: z.enum(importKinds),
  columns: z.array(z.string()),
  rows: z.array(
    z.object({
      row: z.number().int(),
      status: z.enum(['new', 'already_recorded', 'error']),
      plotLabel: z.string(),
      record: importedRecordSchema,
    }),
  ),
  errors: z.array(importRowErrorSchema),
  newCount: z.number().int(),
  alreadyRecordedCount: z.number().int(),
});
export type ImportPreview = z.infer<typeof importPreviewSchema>;
export const importResultSchema = z.object({
  created: z.number().int(),
  alreadyRecorded: z.number().int(),
});

export const exportDatasets = ['harvests', 'observations', 'field-events', 'plot-totals'] as const;
export type ExportDataset = (typeof exportDatasets)[number];
export const exportParams = z.object({
  slug: slugParams.shape.slug,
  dataset: z.enum(exportDatasets, {
    error: 'Choose harvests, observations, field-events or plot-totals.',
  }),
});

// ---------- Value rules shared by forms, the API and CSV import ----------

export interface TraitRule {
  label: string;
  quantityKind: 'mass' | 'length' | 'count' | 'score' | 'date' | 'percent';
  scaleMin: number | null;
  scaleMax: number | null;
}

/** Why a value does not fit a trait, or null when it does. Values are in stored units. */
export function observationValueProblem(
  trait: TraitRule,
  value: number | null,
  valueDate: string | null,
): { field: 'value' | 'valueDate'; message: string } | null {
  if (trait.quantityKind === 'date') {
    if (valueDate === null || value !== null)
      return { field: 'valueDate', message: `${trait.label} is recorded as a date.` };
    return null;
  }
  if (value === null || valueDate !== null)
    return { field: 'value', message: `${trait.label} is recorded as a number.` };
  if (!Number.isFinite(value)) return { field: 'value', message: 'Enter a number.' };
  switch (trait.quantityKind) {
    case 'count':
      if (!Number.isInteger(value) || value < 0)
        return { field: 'value', message: `${trait.label} is a count: a whole number, 0 or more.` };
      return null;
    case 'score':
      if (value < trait.scaleMin! || value > trait.scaleMax!)
        return {
          field: 'value',
          message: `${trait.label} is scored from ${trait.scaleMin} to ${trait.scaleMax}.`,
        };
      return null;
    case 'percent':
      if (value < 0 || value > 100)
        return { field: 'value', message: `${trait.label} is a percentage from 0 to 100.` };
      return null;
    case 'mass':
    case 'length':
      if (value < 0) return { field: 'value', message: `${trait.label} cannot be negative.` };
      return null;
    default: {
      // Every kind is handled above; a new kind in quantityKinds stops the build here.
      const unhandled: never = trait.quantityKind;
      throw new Error(`No value rule for the quantity kind ${String(unhandled)}.`);
    }
  }
}

/** The unit a trait's values are stored and exported in. */
export function storedUnitOf(kind: TraitRule['quantityKind']): string {
  return {
    mass: 'g',
    length: 'mm',
    count: 'count',
    score: 'score',
    percent: 'percent',
    date: 'date',
  }[kind];
}

// ---------- Field-log forms: what a grower types, before units are converted ----------

/**
 * One harvest round at a plot: marketable and cull in one save (either may be left blank,
 * not both), mass in the unit chosen beside the field.
 */
export const harvestEntryForm = z
  .object({
    marketableCount: typedNumber(count('Marketable count', 100_000).optional()),
    marketableMass: typedNumber(nonNegative('Marketable mass', 10_000_000).optional()),
    cullCount: typedNumber(count('Cull count', 100_000).optional()),
    cullMass: typedNumber(nonNegative('Cull mass', 10_000_000).optional()),
    note: noteText,
  })
  .superRefine((v, ctx) => {
    const pairs = [
      ['marketableCount', 'marketableMass'],
      ['cullCount', 'cullMass'],
    ] as const;
    for (const [c, m] of pairs) {
      if (v[c] !== undefined && v[m] === undefined)
        ctx.addIssue({ code: 'custom', path: [m], message: 'Enter the mass of these fruit too.' });
      if (v[m] !== undefined && v[c] === undefined)
        ctx.addIssue({ code: 'custom', path: [c], message: 'Enter how many fruit too.' });
    }
    if (v.marketableCount === undefined && v.marketableMass === undefined)
      if (v.cullCount === undefined && v.cullMass === undefined)
        ctx.addIssue({
          code: 'custom',
          path: ['marketableCount'],
          message: 'Enter the marketable count and mass, the cull, or both.',
        });
  });
export type HarvestEntryForm = z.output<typeof harvestEntryForm>;

/** Values of one trait on sample plants, in the unit shown beside them; blanks are skipped. */
export const measureEntryForm = (trait: TraitRule) =>
  z.object({ values: z.array(typedNumber(finite('Value').optional())) }).superRefine((v, ctx) => {
    v.values.forEach((value, i) => {
      if (value === undefined) return;
      // Units change a mass or a length, never its sign: the trait's rule reads typed values too.
      const p = observationValueProblem(trait, value, null);
      if (p) ctx.addIssue({ code: 'custom', path: ['values', i], message: p.message });
    });
    if (v.values.every((x) => x === undefined))
      ctx.addIssue({ code: 'custom', path: ['values', 0], message: 'Enter at least one value.' });
  });

/** A plot score on the trait's scale. */
export const scoreEntryForm = (trait: TraitRule) =>
  z.object({
    score: typedNumber(
      z
        .number({ error: `Choose a score from ${trait.scaleMin} to ${trait.scaleMax}.` })
        .refine((s) => observationValueProblem(trait, s, null) === null, {
          message: `${trait.label} is scored from ${trait.scaleMin} to ${trait.scaleMax}.`,
        }),
    ),
  });

/** Plants standing now, never more than were set. */
export const standCountEntryForm = (plantsSet: number | null) =>
  z.object({
    plantsSurviving: typedNumber(
      standCountBody.shape.plantsSurviving.refine((n) => plantsSet === null || n <= plantsSet, {
        message: `The plot was set with ${plantsSet} plants; the stand cannot be more.`,
      }),
    ),
  });

/** A note about one plot. */
export const plotNoteForm = z.object({ note: noteText.min(1, 'Write the note.') });

/** How a drip line's flow is typed: per emitter with their spacing, or per length of line. */
export const dripFlowBases = ['emitters', 'line'] as const;

const same = (v: number) => v;
/**
 * The unit each amount of a field event is typed in, by the reader's unit system, and how it
 * becomes the stored unit (exact factors, common/units.ts). Lengths are typed in cm or inches.
 */
export function fieldEventUnits(system: UnitSystem) {
  const us = system === 'us';
  const length = us
    ? { unit: 'in', toStored: (v: number) => toStored(v, 'in') }
    : { unit: 'cm', toStored: (v: number) => toStored(v, 'cm') };
  return {
    runTimeMin: { unit: 'min', toStored: same },
    dripEmitterFlowLPerH: us
      ? { unit: 'gal/h', toStored: gallonsToLitres }
      : { unit: 'L/h', toStored: same },
    dripEmitterSpacingMm: length,
    dripLineFlowLPerHPerM: us
      ? { unit: 'gal/h per 100 ft', toStored: gphPer100FtToLPerHPerM }
      : { unit: 'L/h per m', toStored: same },
    wettedWidthMm: length,
    sprinklerRateMmPerH: us
      ? { unit: 'in/h', toStored: inchesPerHourToMmPerHour }
      : { unit: 'mm/h', toStored: same },
    handVolumeL: us ? { unit: 'gal', toStored: gallonsToLitres } : { unit: 'L', toStored: same },
    wettedAreaM2: us
      ? { unit: 'ft²', toStored: squareFeetToSquareMetres }
      : { unit: 'm²', toStored: same },
    rainMm: us
      ? { unit: 'in', toStored: (v: number) => toStored(v, 'in') }
      : { unit: 'mm', toStored: same },
    rateGPerM2: us
      ? {
          unit: 'lb/100 ft²',
          toStored: (v: number) => (v * G_PER_POUND) / squareFeetToSquareMetres(100),
        }
      : { unit: 'g/m²', toStored: same },
    targetSpacingMm: length,
  } satisfies Record<string, { unit: string; toStored: (typed: number) => number }>;
}
export type FieldEventAmount = keyof ReturnType<typeof fieldEventUnits>;
const eventAmounts = Object.keys(fieldEventUnits('metric')) as FieldEventAmount[];

/** The amounts a kind of event (and an irrigation method, a drip basis) carries. */
function amountsFor(kind: FieldEventKind, method: string, drip: string): FieldEventAmount[] {
  switch (kind) {
    case 'irrigation':
      return [
        'runTimeMin',
        ...(method === 'drip'
          ? drip === 'line'
            ? (['dripLineFlowLPerHPerM', 'wettedWidthMm'] as const)
            : (['dripEmitterFlowLPerH', 'dripEmitterSpacingMm', 'wettedWidthMm'] as const)
          : method === 'overhead'
            ? (['sprinklerRateMmPerH'] as const)
            : (['handVolumeL', 'wettedAreaM2'] as const)),
      ];
    case 'rainfall':
      return ['rainMm'];
    case 'fertilizer':
      return ['rateGPerM2'];
    case 'thinning':
      return ['targetSpacingMm'];
    case 'pruning':
    case 'transplanting':
    case 'note':
      return [];
    default: {
      // Every kind is handled above; a new kind in fieldEventKinds stops the build here.
      const unhandled: never = kind;
      throw new Error(`No amounts for the field event kind ${String(unhandled)}.`);
    }
  }
}

/**
 * A field event as typed at a site: every amount in the reader's unit (`fieldEventUnits`), the
 * ones the chosen kind and method do not use are left out, and the rest are checked by the
 * body's own fields and rules, so the form's messages are the contract's.
 */
export const fieldEventForm = (system: UnitSystem) => {
  const units = fieldEventUnits(system);
  const amountText = Object.fromEntries(eventAmounts.map((k) => [k, z.string()])) as Record<
    FieldEventAmount,
    z.ZodString
  >;
  const amounts = Object.fromEntries(eventAmounts.map((k) => [k, eventFields[k].removeDefault()]));
  return z
    .object({
      kind: eventShape.shape.kind,
      irrigationMethod: z.enum(irrigationMethods),
      dripFlowBasis: z.enum(dripFlowBases),
      noneApplied: z.boolean(),
      amendmentKind: z.string(),
      note: z.string(),
      ...amountText,
    })
    .transform(
      ({ kind, irrigationMethod, dripFlowBasis, noneApplied, amendmentKind, note, ...typed }) => {
        const fertilizer = kind === 'fertilizer';
        const applied = fertilizer && !noneApplied;
        const kept = new Set(
          amountsFor(kind, irrigationMethod, dripFlowBasis).filter(
            (k) => applied || k !== 'rateGPerM2',
          ),
        );
        const read = (k: FieldEventAmount) =>
          kept.has(k)
            ? (readTypedNumber(typed[k], { blank: null, toStored: units[k].toStored }) ?? null)
            : null;
        return {
          kind,
          irrigationMethod: kind === 'irrigation' ? irrigationMethod : null,
          noneApplied: fertilizer && noneApplied,
          amendmentKind: applied ? amendmentKind.trim() || null : null,
          note,
          ...(Object.fromEntries(eventAmounts.map((k) => [k, read(k)])) as Record<
            FieldEventAmount,
            number | null
          >),
        };
      },
    )
    .pipe(
      z
        .object({
          kind: eventShape.shape.kind,
          irrigationMethod: eventFields.irrigationMethod.removeDefault(),
          noneApplied: eventFields.noneApplied.removeDefault(),
          amendmentKind: eventFields.amendmentKind.removeDefault(),
          note: noteText,
          ...(amounts as {
            [K in FieldEventAmount]: ReturnType<(typeof eventFields)[K]['removeDefault']>;
          }),
        })
        .superRefine(checkEvent),
    );
};
export type FieldEventFormValues = z.input<ReturnType<typeof fieldEventForm>>;

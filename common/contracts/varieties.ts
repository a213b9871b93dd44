/**
 * Groups and their variety registers: the layer above single trials, so one variety can be
 * followed from trial to trial and season to season.
 */
import { z } from 'zod';
import { traitDirections } from './trials';

export const varietyTypes = ['open_pollinated', 'heirloom', 'hybrid', 'unknown'] as const;
export type VarietyType = (typeof varietyTypes)[number];
export const varietyTypeLabels: Record<VarietyType, string> = {
  open_pollinated: 'Open-pollinated',
  heirloom: 'Heirloom',
  hybrid: 'Hybrid',
  unknown: 'Unknown',
};

/** A group's own roles; a trial's roles (lead, grower, …) stay with each trial. */
export const groupRoles = ['coordinator', 'member'] as const;
export type GroupRole = (typeof groupRoles)[number];

const address = /^[a-z0-9]+(-[a-z0-9]+)*$/;

/** The cross-season table's and the stability figures' addresses are never a variety's. */
const reservedAddresses = new Set(['compare', 'stability']);
export const varietySlugParams = z.object({
  slug: z
    .string()
    .max(80)
    .regex(address, 'Not a variety address.')
    .refine((s) => !reservedAddresses.has(s), 'Not a variety address.'),
});

const traitKey = z.string().regex(/^[a-z][a-z0-9_]{0,39}$/, 'Not a trait key.');

/* GET /api/groups: the caller's groups and their role in each. */
export const groupListSchema = z.object({
  groups: z.array(
    z.object({ id: z.uuid(), slug: z.string(), name: z.string(), myRole: z.enum(groupRoles) }),
  ),
});
export type GroupList = z.infer<typeof groupListSchema>;

/** A variety's own cover photo, as a URL of each of its sizes; null when it has none. */
export const varietyCoverSchema = z
  .object({ id: z.string(), thumbUrl: z.string(), displayUrl: z.string() })
  .nullable();
export type VarietyCover = z.infer<typeof varietyCoverSchema>;

/* GET /api/varieties: the register of every group the caller belongs to. */
export const varietySummarySchema = z.object({
  id: z.uuid(),
  slug: z.string(),
  name: z.string(),
  crop: z.string(),
  type: z.enum(varietyTypes),
  aliases: z.array(z.string()),
  groupId: z.uuid(),
  /** Trials (and distinct seasons) with an entry of this variety. */
  trialCount: z.number().int(),
  seasonCount: z.number().int(),
  cover: varietyCoverSchema,
});
export type VarietySummary = z.infer<typeof varietySummarySchema>;
export const varietyListSchema = z.object({ varieties: z.array(varietySummarySchema) });
export type VarietyList = z.infer<typeof varietyListSchema>;

const text = (max: number, what: string) =>
  z.string().trim().max(max, `Use at most ${max} characters for the ${what}.`);
const required = (max: number, what: string) => text(max, what).min(1, `Enter the ${what}.`);
/** Short phrases, each kept once (an alias, an expected trait such as "dwarf habit"). */
const phrases = (what: string) =>
  z
    .array(text(80, what).min(1, `Leave no ${what} empty.`))
    .max(20, `Give at most 20 ${what}s.`)
    .transform((list) => [...new Set(list)]);

const varietyFields = {
  name: required(120, 'variety name'),
  crop: required(80, 'crop'),
  type: z.enum(varietyTypes, 'Choose open-pollinated, heirloom, hybrid or unknown.'),
  origin: text(500, 'origin'),
  seedSource: text(200, 'seed source'),
  description: text(2000, 'description'),
  expectedTraits: phrases('expected trait'),
  aliases: phrases('alias'),
};

/* POST /api/varieties (group coordinators) */
export const createVarietyBody = z.object({
  groupId: z.uuid('Choose the group whose register this variety joins.'),
  ...varietyFields,
  type: varietyFields.type.default('unknown'),
  origin: varietyFields.origin.default(''),
  seedSource: varietyFields.seedSource.default(''),
  description: varietyFields.description.default(''),
  expectedTraits: varietyFields.expectedTraits.default([]),
  aliases: varietyFields.aliases.default([]),
});
export type CreateVarietyBody = z.input<typeof createVarietyBody>;

/* PATCH /api/varieties/:slug: only the fields sent change. */
export const updateVarietyBody = z
  .object({
    ...varietyFields,
    /** A photo of one of the variety's entries; null clears the cover. */
    coverPhotoId: z.uuid('Choose one of this variety’s photos.').nullable(),
  })
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export type UpdateVarietyBody = z.input<typeof updateVarietyBody>;

/** One phrase per line or separated by commas, as a person types a list into a text box. */
const phraseList = (what: string) =>
  z
    .string()
    .transform((s) =>
      s
        .split(/[\n,]/)
        .map((p) => p.trim())
        .filter(Boolean),
    )
    .pipe(phrases(what));

/** The register form: lists are typed into text boxes. */
export const varietyForm = z.object({
  ...varietyFields,
  groupId: z.uuid('Choose the group whose register this variety joins.'),
  expectedTraits: phraseList('expected trait'),
  aliases: phraseList('alias'),
});
export type VarietyFormValues = z.input<typeof varietyForm>;

export const varietySchema = z.object({
  id: z.uuid(),
  slug: z.string(),
  name: z.string(),
  crop: z.string(),
  type: z.enum(varietyTypes),
  origin: z.string(),
  seedSource: z.string(),
  description: z.string(),
  expectedTraits: z.array(z.string()),
  aliases: z.array(z.string()),
  group: z.object({ id: z.uuid(), slug: z.string(), name: z.string() }),
  /** Shown only where the caller may already see that photo on this page. */
  cover: varietyCoverSchema,
});
export type Variety = z.infer<typeof varietySchema>;

/** A trait of one trial, for one variety's entry in it. */
export const varietyTraitSchema = z.object({
  key: z.string(),
  label: z.string(),
  /** SI unit of the means (g, mm, …); the client converts for the reader. */
  unit: z.string(),
  direction: z.enum(traitDirections),
  decimals: z.number().int(),
  /** The entry's mean over the trial (least-squares where the layout was unbalanced). */
  mean: z.number().nullable(),
  /** 1 = best among the trial's entries in the trait's direction; null without a direction. */
  rank: z.number().int().nullable(),
  entryCount: z.number().int(),
  /** Letter group: entries sharing a letter do not differ significantly. */
  group: z.string(),
  /** The entry's arithmetic mean of plot values at each site of the trial. */
  sites: z.array(z.object({ site: z.string(), mean: z.number(), n: z.number().int() })),
});
export type VarietyTrait = z.infer<typeof varietyTraitSchema>;

export const varietyTrialSchema = z.object({
  slug: z.string(),
  title: z.string(),
  season: z.string(),
  /** `trial`: the caller is a member and sees live figures; `sheet`: the published version. */
  view: z.enum(['trial', 'sheet']),
  version: z.number().int().nullable(),
  entry: z.object({ name: z.string(), code: z.string(), notes: z.string() }),
  sites: z.array(z.object({ name: z.string(), region: z.string() })),
  traits: z.array(varietyTraitSchema),
  warnings: z.array(z.string()),
});
export type VarietyTrial = z.infer<typeof varietyTrialSchema>;

/* GET /api/varieties/:slug */
export const varietyRecordSchema = z.object({
  variety: varietySchema,
  canEdit: z.boolean(),
  /** Oldest season first. */
  trials: z.array(varietyTrialSchema),
  photos: z.array(
    z.object({
      id: z.string(),
      caption: z.string(),
      trialSlug: z.string(),
      season: z.string(),
      thumbUrl: z.string(),
      displayUrl: z.string(),
    }),
  ),
});
export type VarietyRecord = z.infer<typeof varietyRecordSchema>;

/* GET /api/varieties/compare?varieties=a,b&trait=key */
export const compareQuery = z.object({
  varieties: z
    .string()
    .transform((s) => [...new Set(s.split(',').filter(Boolean))])
    .pipe(
      z
        .array(z.string().regex(address, 'Not a variety address.'))
        .min(2, 'Choose at least two varieties.')
        .max(12, 'Choose at most 12 varieties.'),
    ),
  trait: traitKey.optional(),
});
export type CompareQuery = z.input<typeof compareQuery>;

const traitChoices = z.array(z.object({ key: z.string(), label: z.string() }));
const chosenTrait = z
  .object({
    key: z.string(),
    label: z.string(),
    /** SI unit of the means; the client converts for the reader. */
    unit: z.string(),
    direction: z.enum(traitDirections),
    decimals: z.number().int(),
  })
  .nullable();
/** An environment: one site of one trial. */
const environmentSchema = z.object({
  trialSlug: z.string(),
  trialTitle: z.string(),
  season: z.string(),
  site: z.string(),
});
export type Environment = z.infer<typeof environmentSchema>;

export const comparisonSchema = z.object({
  varieties: z.array(z.object({ slug: z.string(), name: z.string() })),
  /** Traits measured in at least one trial of the chosen varieties. */
  traits: traitChoices,
  trait: chosenTrait,
  /** One column per trial and site (an environment), oldest season first. */
  columns: z.array(environmentSchema),
  /** Per variety, its mean in each column (null: not grown or not measured there). */
  rows: z.array(z.object({ slug: z.string(), means: z.array(z.number().nullable()) })),
  /** Every pair of chosen varieties: the trials they shared (grown in the same trial). */
  pairs: z.array(
    z.object({
      a: z.string(),
      b: z.string(),
      sharedTrials: z.number().int(),
      /** Mean of a − b over the environments where both were measured; null when none. */
      difference: z.number().nullable(),
      sharedEnvironments: z.number().int(),
    }),
  ),
});
export type Comparison = z.infer<typeof comparisonSchema>;

/* GET /api/varieties/stability?group=…&crop=…&trait=… */
export const stabilityQuery = z.object({
  group: z.uuid('Choose the group whose register to read.'),
  crop: z.string().trim().min(1, 'Choose a crop.').max(80, 'Not a crop of the register.'),
  trait: traitKey.optional(),
});
export type StabilityQuery = z.input<typeof stabilityQuery>;

export const stabilitySchema = z.object({
  crop: z.string(),
  /** Crops of the group's register, to choose from. */
  crops: z.array(z.string()),
  /** Traits measured in at least one trial of the crop's varieties. */
  traits: traitChoices,
  trait: chosenTrait,
  /**
   * Every environment a variety of the crop was measured in (oldest season first); `used`:
   * in the balanced subset the figures were computed on, else `reason` says why not.
   */
  environments: z.array(
    environmentSchema.extend({
      used: z.boolean(),
      reason: z.string().nullable(),
      /** Mean of the subset's varieties here, and that minus the grand mean (the index). */
      mean: z.number().nullable(),
      index: z.number().nullable(),
    }),
  ),
  varieties: z.array(
    z.object({
      slug: z.string(),
      name: z.string(),
      environmentCount: z.number().int(),
      used: z.boolean(),
      reason: z.string().nullable(),
      figures: z
        .object({
          mean: z.number(),
          /** Regression on the environment index (Finlay and Wilkinson 1963). */
          slope: z.number(),
          slopeSe: z.number(),
          rSquared: z.number(),
          /** Two-sided p of slope = 1. */
          slopeVersusOneP: z.number(),
          /** Deviation mean square from the regression (Eberhart and Russell 1966), unit². */
          deviationMs: z.number(),
          deviationDf: z.number().int(),
          /** Wricke's ecovalence (1962), unit², and its share of the interaction (0–1). */
          ecovalence: z.number(),
          ecovalenceShare: z.number(),
        })
        .nullable(),
    }),
  ),
  grandMean: z.number().nullable(),
  /** Why there are no figures (too few environments or varieties); null when there are. */
  notice: z.string().nullable(),
});
export type Stability = z.infer<typeof stabilitySchema>;

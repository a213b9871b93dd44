/**
 * The results sheet: the lead's draft, and the frozen snapshot each published version keeps.
 * A published snapshot is what readers see, print and download; it never changes.
 */
import { z } from 'zod';
import { formatF, formatP } from '../display-units';
import { decimalsFor, recordedDecimals } from '../precision';
import {
  analysisBases,
  analysisModels,
  twoFactorSchema,
  type TwoFactor,
  varianceComponentSchema,
  varietyTestSchema,
} from './analysis';
import { entryTypes, traitDirections, traitDisplayUnits, trialDesigns } from './trials';
import { blankAsNull, typedNumber } from './typed-input';

export const licenses = ['CC-BY-4.0', 'CC-BY-SA-4.0', 'CC0-1.0', 'all-rights-reserved'] as const;
export const licenseLabels: Record<(typeof licenses)[number], string> = {
  'CC-BY-4.0': 'Creative Commons Attribution 4.0 (CC BY 4.0)',
  'CC-BY-SA-4.0': 'Creative Commons Attribution-ShareAlike 4.0 (CC BY-SA 4.0)',
  'CC0-1.0': 'Public domain dedication (CC0 1.0)',
  'all-rights-reserved': 'All rights reserved',
};

const slug = z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.');
export const resultSlugParams = z.object({ slug });
export const resultVersionParams = z.object({
  slug,
  version: z.coerce.number().int('Versions are whole numbers.').min(1, 'Versions start at 1.'),
});

const rankingWeight = z
  .number({ error: 'Enter a weight from 0 to 10.' })
  .min(0, 'Weights are 0 or more.')
  .max(10, 'Weights are at most 10.');
export const sheetTraitSchema = z.object({
  key: z.string().regex(/^[a-z][a-z0-9_]{0,39}$/, 'Not a trait key.'),
  basis: z.enum(analysisBases).default('plot'),
  weight: rankingWeight.default(1),
});
export type SheetTrait = z.infer<typeof sheetTraitSchema>;

/* PUT /api/trials/:slug/results-sheet */
export const saveSheetBody = z.object({
  summary: z.string().max(10_000, 'Keep the summary under 10,000 characters.'),
  methods: z.string().max(10_000, 'Keep the methods under 10,000 characters.').nullable(),
  traits: z
    .array(sheetTraitSchema)
    .min(1, 'Choose at least one trait.')
    .max(20, 'At most 20 traits.'),
  entryNotes: z.record(
    z.uuid(),
    z.string().max(2000, 'Keep each entry note under 2,000 characters.'),
  ),
  coverPhotos: z.record(z.uuid(), z.uuid()),
  alpha: z
    .number({ error: 'Enter a significance level such as 0.05.' })
    .gt(0, 'Alpha is more than 0.')
    .lt(0.5, 'Alpha is less than 0.5.'),
  letters: z.enum(['hsd', 'lsd']),
  /** The model every trait is analysed with; null (or left out): the one the design suggests. */
  model: z.enum(analysisModels).nullable().default(null),
  license: z.enum(licenses),
});
export type SaveSheetBody = z.infer<typeof saveSheetBody>;

/** Text fields left blank stand for "none" (no note, no chosen cover photo). */
const withoutBlanks = (texts: Record<string, string>) =>
  Object.fromEntries(Object.entries(texts).filter(([, text]) => text !== ''));
/**
 * The sheet editor's form: α and the weights as typed, a note and a cover choice for every
 * entry (blank: none), and whether the lead writes the methods; otherwise they are generated
 * (sent as null).
 */
export const saveSheetForm = z
  .object({
    summary: saveSheetBody.shape.summary,
    ownMethods: z.boolean(),
    methods: saveSheetBody.shape.methods.unwrap(),
    traits: z
      .array(sheetTraitSchema.extend({ weight: typedNumber(rankingWeight) }))
      .min(1, 'Choose at least one trait.')
      .max(20, 'At most 20 traits.'),
    entryNotes: z
      .record(z.string(), z.string())
      .transform(withoutBlanks)
      .pipe(saveSheetBody.shape.entryNotes),
    coverPhotos: z
      .record(z.string(), z.string())
      .transform(withoutBlanks)
      .pipe(saveSheetBody.shape.coverPhotos),
    alpha: typedNumber(saveSheetBody.shape.alpha),
    letters: saveSheetBody.shape.letters,
    model: blankAsNull(saveSheetBody.shape.model),
    license: saveSheetBody.shape.license,
  })
  .transform(({ ownMethods, methods, ...body }) => ({
    ...body,
    methods: ownMethods ? methods : null,
  }));

export const sheetDraftSchema = saveSheetBody.extend({
  generatedMethods: z.string(),
  publishedVersion: z.number().int().nullable(),
  isPublic: z.boolean(),
});
export type SheetDraft = z.infer<typeof sheetDraftSchema>;

/* POST /api/trials/:slug/results-sheet/publish */
export const publishBody = z.object({
  changeNote: z
    .string()
    .trim()
    .max(2000, 'Keep the change note under 2,000 characters.')
    .default(''),
});

const anovaLine = z.object({
  source: z.string(),
  df: z.number(),
  ss: z.number(),
  ms: z.number().nullable(),
  f: z.number().nullable(),
  p: z.number().nullable(),
  testedAgainst: z.string().nullable(),
});
const meanLine = z.object({
  variety: z.string(),
  n: z.number(),
  mean: z.number(),
  sd: z.number().nullable(),
  se: z.number().nullable(),
  /** Least-squares mean and its SE, stored when the layout was unbalanced (rank and letters follow it). */
  adjustedMean: z.number().optional(),
  adjustedSe: z.number().nullable().optional(),
  /** Versions published before ranks followed the direction hold a number here for every trait. */
  rank: z.number().nullable(),
  group: z.string(),
});

export const snapshotTraitSchema = z.object({
  key: z.string(),
  label: z.string(),
  unit: z.string(),
  /** The lead's unit for the trait when published (versions before it: chosen by size). */
  displayUnit: z.enum(traitDisplayUnits).optional(),
  quantityKind: z.string(),
  basis: z.enum(analysisBases),
  direction: z.enum(traitDirections),
  weight: z.number(),
  /** Decimals to show plot values and means with (versions before it: from the plot values). */
  decimals: z.object({ plotValue: z.number().int(), mean: z.number().int() }).optional(),
  design: z.enum(trialDesigns),
  n: z.number(),
  grandMean: z.number(),
  cvPercent: z.number().nullable(),
  anova: z.array(anovaLine),
  means: z.array(meanLine),
  lsd: z.object({
    value: z.number().nullable(),
    df: z.number(),
    t: z.number().nullable(),
    protected: z.boolean().optional(),
  }),
  hsd: z.object({ value: z.number().nullable(), q: z.number().nullable() }),
  /** The model the numbers came from (versions before the choice: the classical analysis). */
  model: z.enum(analysisModels).optional(),
  /** Mixed model only: REML variance components, the variety test, the split in words. */
  varianceComponents: z.array(varianceComponentSchema).optional(),
  fixedTest: varietyTestSchema.optional(),
  varianceSummary: z.string().optional(),
  /**
   * Two-factor trials only: the cell, treatment and variety means with their SEs, the simple
   * effects, and the strata in words as published (the interaction test is the anova's
   * `variety:treatment` line). `means` above are the variety means over every level.
   */
  twoFactor: twoFactorSchema.extend({ strata: z.string() }).optional(),
  warnings: z.array(z.string()),
});
export type SnapshotTrait = z.infer<typeof snapshotTraitSchema>;

export const resultSnapshotSchema = z.object({
  trial: z.object({
    title: z.string(),
    slug: z.string(),
    crop: z.string(),
    season: z.string(),
    design: z.enum(trialDesigns),
    description: z.string(),
    sowingDate: z.string().nullable(),
    transplantDate: z.string().nullable(),
  }),
  version: z.number().int(),
  publishedAt: z.string(),
  changeNote: z.string(),
  alpha: z.number(),
  letters: z.enum(['hsd', 'lsd']),
  /** The model the sheet was analysed with (versions before the choice: the classical analysis). */
  model: z.enum(analysisModels).optional(),
  license: z.enum(licenses),
  summary: z.string(),
  methods: z.string(),
  plotCount: z.number().int(),
  sites: z.array(
    z.object({
      name: z.string(),
      region: z.string(),
      soilTexture: z.string().nullable(),
      irrigationMethod: z.string().nullable(),
      rainMm: z.number().nullable(),
      irrigationMm: z.number().nullable(),
      degreeDays: z.number().nullable(),
      degreeDayBaseC: z.number().nullable(),
      hotDays: z.number().nullable(),
    }),
  ),
  entries: z.array(
    z.object({
      id: z.string(),
      code: z.string(),
      name: z.string(),
      seedSource: z.string(),
      entryType: z.enum(entryTypes),
      /**
       * The register variety the entry was grown as (its page is `/varieties/<slug>`); null when
       * the entry is linked to none. Versions published before this field lack it: the server
       * fills it in from the entry's register link when it reads them (see `frozenFromStamp`).
       */
      varietySlug: z.string().nullable().optional(),
      note: z.string(),
      caution: z.string().nullable(),
      photo: z
        .object({
          id: z.string(),
          caption: z.string(),
          width: z.number().nullable(),
          height: z.number().nullable(),
        })
        .nullable(),
    }),
  ),
  traits: z.array(snapshotTraitSchema),
  ranking: z.array(
    z.object({
      variety: z.string(),
      rank: z.number(),
      index: z.number(),
      rankSum: z.number().nullable(),
      contributions: z.record(z.string(), z.number()),
    }),
  ),
  cautions: z.array(z.string()),
  plotValues: z.array(
    z.object({
      trait: z.string(),
      site: z.string().nullable(),
      block: z.string().nullable(),
      plot: z.string().nullable(),
      variety: z.string(),
      /** Two-factor trials only: the plot's level of the treatment. */
      treatment: z.string().optional(),
      value: z.number(),
    }),
  ),
});
export type ResultSnapshot = z.infer<typeof resultSnapshotSchema>;

export const versionListSchema = z.object({
  title: z.string(),
  versions: z.array(
    z.object({ version: z.number(), publishedAt: z.string(), changeNote: z.string() }),
  ),
});

/* POST /api/results/:slug/followers */
export const followBody = z.object({
  email: z
    .email('Enter an e-mail address like name@example.org.')
    .max(254)
    .transform((e) => e.toLowerCase()),
});
export const followerTokenQuery = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, 'This link is not valid.'),
});

/* GET /api/results: the public index of published sheets, newest first. */
export const publishedSheetsQuery = z.object({
  q: z.string().trim().max(100, 'Use at most 100 characters.').default(''),
  page: z.coerce
    .number()
    .int('Pages are whole numbers.')
    .min(1, 'Pages start at 1.')
    .max(100_000)
    .default(1),
  pageSize: z.coerce.number().int().min(1).max(50, 'At most 50 per page.').default(20),
});
export type PublishedSheetsQuery = z.infer<typeof publishedSheetsQuery>;
export const publishedSheetListSchema = z.object({
  sheets: z.array(
    z.object({
      slug: z.string(),
      title: z.string(),
      crop: z.string(),
      season: z.string(),
      version: z.number().int(),
      publishedAt: z.string(),
      entryCount: z.number().int(),
    }),
  ),
  page: z.number().int(),
  pageSize: z.number().int(),
  total: z.number().int(),
});
export type PublishedSheetList = z.infer<typeof publishedSheetListSchema>;

/** Decimals for a published trait's plot values and means (common/precision.ts). */
export function sheetTraitDecimals(
  s: Pick<ResultSnapshot, 'plotValues'>,
  t: Pick<SnapshotTrait, 'key' | 'decimals'>,
): { plotValue: number; mean: number } {
  if (t.decimals) return t.decimals;
  const plotValue = recordedDecimals(
    s.plotValues.filter((v) => v.trait === t.key).map((v) => v.value),
  );
  return { plotValue, mean: decimalsFor('mean', plotValue) };
}

/** The model a published version used; versions from before the choice used the classical one. */
export const sheetModel = (s: Pick<ResultSnapshot, 'model'>) => s.model ?? 'anova';

/**
 * A two-factor trait's interaction test in one line, from its analysis of variance, e.g.
 * "Variety × fertilizer: F(3, 18) = 12.40, p < 0.001"; null without one.
 */
export function interactionNote(t: {
  anova: Pick<SnapshotTrait['anova'][number], 'source' | 'df' | 'f' | 'p' | 'testedAgainst'>[];
  twoFactor?: { factor: string; fixedTests?: TwoFactor['fixedTests'] } | undefined;
}): string | null {
  if (!t.twoFactor) return null;
  const name = `Variety × ${t.twoFactor.factor.toLowerCase()}`;
  const pText = (p: number | null) => {
    const text = formatP(p);
    return text.startsWith('<') ? text : `= ${text}`;
  };
  // The mixed model (a split plot that lost plots) tests it by Wald F with Satterthwaite's df.
  const wald = t.twoFactor.fixedTests?.find((l) => l.source === 'variety:treatment');
  if (wald)
    return `${name}: F(${wald.numDf}, ${wald.denDf.toFixed(1)}) = ${formatF(wald.f)}, p ${pText(wald.p)} (Wald, Satterthwaite df)`;
  const line = t.anova.find((l) => l.source === 'variety:treatment');
  if (!line || line.f === null) return null;
  const error = t.anova.find((l) => l.source === line.testedAgainst);
  return `${name}: F(${line.df}, ${error?.df ?? '?'}) = ${formatF(line.f)}, p ${pText(line.p)}`;
}

/** The treatment of a two-factor sheet (name, levels, layout), from its first trait; else null. */
export const sheetFactor = (s: Pick<ResultSnapshot, 'traits'>) =>
  s.traits.find((t) => t.twoFactor)?.twoFactor ?? null;

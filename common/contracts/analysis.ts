/**
 * Replicate statistics: a trial's analysis per trait, the ranking across traits, and the
 * spreadsheet analysis. The result shape is the analyze command's JSON (the engine's
 * AnalysisResult), so the API, the command and the screens read the same numbers.
 */
import { z } from 'zod';
import { trialDesigns } from './trials';

export const analysisBases = ['plot', 'plant', 'm', 'm2', 'ha', 'acre'] as const;
export type AnalysisBasis = (typeof analysisBases)[number];

export const basisLabels: Record<AnalysisBasis, string> = {
  plot: 'per plot',
  plant: 'per plant',
  m: 'per metre of row',
  m2: 'per square metre',
  ha: 'per hectare (estimate)',
  acre: 'per acre (estimate)',
};

/** Traits the API derives from harvest records, beside the trial's own traits. */
export const derivedTraits = {
  // Counted in days from sowing or transplant, like a trait recorded as a date.
  days_to_first_harvest: {
    label: 'Days to first harvest',
    quantityKind: 'date',
    direction: 'lower',
  },
  mean_fruit_mass: { label: 'Mean marketable fruit mass', quantityKind: 'mass', direction: 'none' },
} as const;
export type DerivedTraitKey = keyof typeof derivedTraits;

export const designs = ['crd', 'rcbd', 'multisite'] as const;
/** The classical analysis of variance, or REML with gardens and blocks random. */
export const analysisModels = ['anova', 'mixed'] as const;
export type AnalysisModel = (typeof analysisModels)[number];
export const modelLabels: Record<AnalysisModel, string> = {
  anova: 'Classical analysis of variance',
  mixed: 'Mixed model (REML)',
};

/**
 * The models a design can be analysed with: a completely randomized trial has no gardens or
 * blocks to treat as random, so only the classical analysis applies to it.
 */
export function modelsForDesign(
  design: (typeof trialDesigns)[number],
  /** A two-factor trial: its strata come from the classical analysis only, so far. */
  twoFactor = false,
  /** A two-factor trial laid out as a split plot: the mixed model takes it too. */
  splitPlot = false,
): AnalysisModel[] {
  if (twoFactor) return splitPlot ? ['anova', 'mixed'] : ['anova'];
  return design === 'crd' ? ['anova'] : ['anova', 'mixed'];
}

/**
 * The model a design is analysed with unless the lead chooses otherwise: complete blocks at one
 * site by the classical analysis; several sites by the mixed model, which uses every plot of a
 * garden that lost some and weighs gardens by what they hold.
 */
export function defaultModelFor(
  design: (typeof trialDesigns)[number],
  twoFactor = false,
): AnalysisModel {
  if (twoFactor) return 'anova';
  switch (design) {
    case 'crd':
    case 'rcbd':
      return 'anova';
    case 'multisite':
    case 'incomplete':
    case 'network':
      return 'mixed';
    default: {
      const never: never = design;
      return never;
    }
  }
}

/** Why the design suggests its model, where the reason is not obvious (shown beside the choice). */
export function modelReasonFor(design: (typeof trialDesigns)[number]): string | null {
  switch (design) {
    case 'incomplete':
      return 'Each block holds only some of the entries, so two entries are compared partly across blocks. The mixed model treats blocks within replicates as random and uses those comparisons too; the classical analysis treats blocks as fixed and uses only comparisons within a block, so it gives wider standard errors and is not the default.';
    case 'network':
      return 'Each garden grows only some of the entries and gardens differ more than varieties do. The mixed model treats gardens as random, so it compares entries through every garden, including those that lost plots; the classical analysis treats gardens as fixed and uses only comparisons within a garden, so it gives wider standard errors and is not the default.';
    case 'crd':
    case 'rcbd':
    case 'multisite':
      return null;
    default: {
      const never: never = design;
      return never;
    }
  }
}
export const varianceSources = [
  'block:treatment',
  'site',
  'site:block',
  'block',
  'site:variety',
  'replicate',
  'replicate:block',
  'residual',
] as const;
export const varianceSourceLabels: Record<(typeof varianceSources)[number], string> = {
  'block:treatment': 'Main plots (block × treatment)',
  site: 'Gardens (sites)',
  'site:block': 'Blocks within gardens',
  block: 'Blocks',
  'site:variety': 'Garden × variety',
  replicate: 'Replicates',
  'replicate:block': 'Blocks within replicates',
  residual: 'Plot to plot (residual)',
};

/** The variance sources with varieties random. */
export const varietiesRandomSourceLabels = {
  variety: 'Varieties',
  ...varianceSourceLabels,
} as const;

/** What the heritability figure means, for every place that shows it. */
export const HERITABILITY_NOTE =
  'Heritability on an entry-mean basis: the share of the differences between entry means that would show again in another trial like this one, σ²g ÷ (σ²g + v̄/2) with v̄ the mean variance of a difference between two entry estimates (Piepho & Möhring 2007). Near 1, the entry means are a reliable guide; low, the trial needs more replicates or sites to tell the entries apart.';

/** How the variety test's denominator degrees of freedom were found, in words. */
export const ddfMethodLabels = {
  satterthwaite: 'Satterthwaite',
  'kenward-roger': 'Kenward–Roger',
} as const;

/**
 * One line on the model behind a set of numbers, for every place that shows them (analysis
 * page, web sheet, PDF) so they say the same.
 */
export function modelNote(model: AnalysisModel): string {
  return model === 'anova'
    ? `${modelLabels.anova}: sequential (type I) sums of squares.`
    : `${modelLabels.mixed}: varieties fixed, gardens and blocks random; means are the model's estimates (BLUEs) with their standard errors.`;
}

/** The mixed model's variety test in one line. */
export function varietyTestNote(test: {
  numDf: number;
  denDf: number;
  f: number;
  p: number;
  method: keyof typeof ddfMethodLabels;
}): string {
  const p = test.p < 0.001 ? 'p < 0.001' : `p = ${test.p.toFixed(3)}`;
  return `Varieties: F = ${test.f.toFixed(2)} on ${test.numDf} and ${test.denDf.toFixed(1)} df (${ddfMethodLabels[test.method]}), ${p}.`;
}
export const letterMethods = ['hsd', 'lsd'] as const;

const alpha = z.coerce
  .number({ error: 'Enter a significance level such as 0.05.' })
  .gt(0, 'The significance level must be above 0.')
  .lt(1, 'The significance level must be below 1.')
  .default(0.05);

export const traitKey = z
  .string()
  .regex(/^[a-z][a-z0-9_]{0,39}$/, 'Not a trait key (lowercase letters, digits, _).');

export const trialAnalysisQuery = z.object({
  trait: traitKey,
  basis: z.enum(analysisBases).default('plot'),
  alpha,
  letters: z.enum(letterMethods).default('hsd'),
  /**
   * Left out: the classical analysis, as the analyze command's default, except for incomplete
   * blocks and networks, which the mixed model analyses (the page always sends one).
   */
  model: z.enum(analysisModels).optional(),
  /** With the mixed model: also fit varieties as random (BLUPs, heritability). */
  varietiesRandom: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
});
export type TrialAnalysisQuery = z.input<typeof trialAnalysisQuery>;

const nullableNumber = z.number().nullable();
/** Sources of an analysis of variance; a two-factor trial adds its treatment's lines. */
export const anovaSources = [
  'site',
  'block',
  'treatment',
  'block:treatment',
  'variety',
  'variety:treatment',
  'site:variety',
  'residual',
  'total',
] as const;

export const anovaLineSchema = z.object({
  source: z.enum(anovaSources),
  df: z.number(),
  ss: z.number(),
  ms: nullableNumber,
  f: nullableNumber,
  p: nullableNumber,
  testedAgainst: z.enum(anovaSources).nullable(),
});
export type AnovaLine = z.infer<typeof anovaLineSchema>;

export const entryMeanSchema = z.object({
  variety: z.string(),
  n: z.number(),
  mean: z.number(),
  sd: nullableNumber,
  se: nullableNumber,
  cvPercent: nullableNumber,
  min: z.number(),
  max: z.number(),
  /** 1 = best in the trait's direction; null when the trait has no preferred direction. */
  rank: z.number().nullable(),
  group: z.string(),
  groupLsd: z.string(),
  groupHsd: z.string(),
});
export type EntryMean = z.infer<typeof entryMeanSchema>;

/** A mixed model's variance component (REML) and its asymptotic SE (null at zero). */
export const varianceComponentSchema = z.object({
  source: z.enum(varianceSources),
  variance: z.number(),
  se: nullableNumber,
});
/** A mixed model's Wald F test for varieties. */
export const varietyTestSchema = z.object({
  numDf: z.number(),
  denDf: z.number(),
  f: z.number(),
  p: z.number(),
  method: z.enum(['satterthwaite', 'kenward-roger']),
});

/** Varieties as random (a second REML fit): their variance, BLUPs and the heritability. */
export const varietiesRandomSchema = z.object({
  varianceComponents: z.array(
    varianceComponentSchema.extend({ source: z.enum(['variety', ...varianceSources]) }),
  ),
  /**
   * μ̂ + BLUP per variety, best first in the trait's direction; rank 1 = best (ties share it),
   * null with no direction.
   */
  blups: z.array(
    z.object({
      variety: z.string(),
      blup: z.number(),
      predicted: z.number(),
      rank: z.number().int().positive().nullable(),
    }),
  ),
  /** Mean variance of a difference of two BLUEs (varieties fixed). */
  meanVarianceOfBlueDifferences: z.number(),
  /** σ²g ÷ (σ²g + v̄/2), on an entry-mean basis (Piepho & Möhring 2007). */
  heritability: z.number(),
  logLik: z.number(),
  boundary: z.boolean(),
  summary: z.string(),
});

/** The analyze command's JSON. */
export const analysisResultSchema = z.object({
  design: z.enum(designs),
  trait: z.string(),
  alpha: z.number(),
  n: z.number(),
  grandMean: z.number(),
  cvPercent: nullableNumber,
  anova: z.array(anovaLineSchema),
  means: z.array(entryMeanSchema),
  lsd: z.object({ value: nullableNumber, df: z.number(), t: z.number(), protected: z.boolean() }),
  hsd: z.object({ value: nullableNumber, q: z.number(), df: z.number() }),
  letters: z.enum(letterMethods),
  errorTerm: z.object({
    source: z.enum(['residual', 'site:variety']),
    df: z.number(),
    ms: z.number(),
  }),
  method: z.enum(['means', 'least-squares']),
  /** Which model the ranks and letters come from. */
  model: z.enum(analysisModels),
  /** Least-squares means in rank order (equal to the arithmetic means on balanced layouts). */
  adjustedMeans: z.array(z.object({ variety: z.string(), mean: z.number(), se: nullableNumber })),
  counts: z.object({
    entries: z.number(),
    sites: z.number(),
    blocks: z.number(),
    rows: z.number(),
    missingPlots: z.number(),
  }),
  /** Why the letters are empty (too many entries for the letter display), else null. */
  lettersOmitted: z.string().nullable().optional(),
  /** Mixed model only: REML variance components with an asymptotic SE (null at zero). */
  varianceComponents: z.array(varianceComponentSchema).optional(),
  /** Mixed model only: Wald F test for varieties with Satterthwaite's denominator df. */
  fixedTest: varietyTestSchema.extend({ source: z.literal('variety') }).optional(),
  /** Mixed model only: REML log-likelihood. */
  logLik: z.number().optional(),
  /** Mixed model only: a variance component was estimated as zero. */
  boundary: z.boolean().optional(),
  /** Mixed model only: how the variation splits between gardens, blocks and residual. */
  varianceSummary: z.string().optional(),
  /** Mixed model, when asked: varieties random, BLUPs and heritability. */
  varietiesRandom: varietiesRandomSchema.optional(),
  pairs: z
    .array(
      z.object({
        a: z.string(),
        b: z.string(),
        difference: z.number(),
        se: z.number(),
        lsdSeparated: z.boolean(),
        hsdSeparated: z.boolean(),
        t: nullableNumber,
        p: nullableNumber,
        pTukey: nullableNumber,
      }),
    )
    .optional(),
  warnings: z.array(z.string()),
});
export type AnalysisResult = z.infer<typeof analysisResultSchema>;

export const plotValueSchema = z.object({
  plotId: z.uuid(),
  plotNumber: z.number().int(),
  site: z.string(),
  block: z.number().int(),
  entry: z.string(),
  entryCode: z.string(),
  /** The plot's level of the second factor (two-factor trials only). */
  treatment: z.string().nullable().optional(),
  value: z.number(),
});
export type PlotValue = z.infer<typeof plotValueSchema>;

const simpleEffectSchema = z.object({
  /** The level the comparison is made within (a variety, or a treatment level). */
  within: z.string(),
  a: z.string(),
  b: z.string(),
  difference: z.number(),
  se: z.number(),
  df: z.number(),
  t: z.number(),
  p: z.number(),
});
const meanWithSe = { mean: z.number(), se: z.number(), df: z.number() };

/**
 * A two-factor trial (treatment × variety): the layout, the cell and treatment means (least
 * squares, with their SE and df) and the simple effects of each factor within the other.
 */
export const twoFactorSchema = z.object({
  /** The treatment's name (e.g. Fertilizer) and its levels in the lead's order. */
  factor: z.string(),
  levels: z.array(z.string()),
  layout: z.enum(['factorial', 'split-plot']),
  cellMeans: z.array(z.object({ variety: z.string(), treatment: z.string(), ...meanWithSe })),
  treatmentMeans: z.array(z.object({ treatment: z.string(), ...meanWithSe })),
  varietyMeans: z.array(z.object({ variety: z.string(), ...meanWithSe })),
  treatmentWithinVariety: z.array(simpleEffectSchema),
  varietyWithinTreatment: z.array(simpleEffectSchema),
  /** Split plot by the mixed model: sequential Wald F tests with Satterthwaite's df. */
  fixedTests: z
    .array(
      z.object({
        source: z.enum(['treatment', 'variety', 'variety:treatment']),
        numDf: z.number(),
        denDf: z.number(),
        f: z.number(),
        p: z.number(),
        method: z.literal('satterthwaite'),
      }),
    )
    .optional(),
});
export type TwoFactor = z.infer<typeof twoFactorSchema>;

/** The strata of a two-factor analysis in words, for the page and the sheet. */
export function twoFactorNote(t: Pick<TwoFactor, 'layout' | 'factor'>, model: AnalysisModel) {
  const f = t.factor.toLowerCase();
  if (model === 'mixed')
    return `Split plot, mixed model (REML): blocks and main plots (block × ${f}) random; ${f}, variety and their interaction fixed, tested by Wald F with Satterthwaite's df.`;
  return t.layout === 'split-plot'
    ? `Split plot: ${f} is on main plots and is tested against the main-plot error (block × ${f}); variety and variety × ${f} are tested against the subplot error (residual).`
    : `Factorial in complete blocks: every line is tested against the residual; sequential sums of squares in the order block, ${f}, variety, variety × ${f}.`;
}

export const trialAnalysisSchema = analysisResultSchema.extend({
  traitKey: z.string(),
  traitLabel: z.string(),
  quantityKind: z.string(),
  direction: z.enum(['higher', 'lower', 'none']),
  basis: z.enum(analysisBases),
  /** SI unit of every value, mean, SE, LSD and HSD (SS and MS are in its square). */
  unit: z.string(),
  /** Decimals (in `unit`) to show or export plot values and means with: common/precision.ts. */
  decimals: z.object({ plotValue: z.number().int(), mean: z.number().int() }),
  /** How the plot value was built, in words. */
  valueNote: z.string(),
  plotValues: z.array(plotValueSchema),
  /** Entry name → code, for compact tables. */
  entryCodes: z.record(z.string(), z.string()),
  /** Two-factor trials only: the treatment × variety analysis. */
  twoFactor: twoFactorSchema.optional(),
});
export type TrialAnalysis = z.infer<typeof trialAnalysisSchema>;

/** `traits=a,b&weights=2,1` — weights default to 1; directions come from each trait. */
export const rankingQuery = z
  .object({
    traits: z
      .string()
      .optional()
      .transform((s) => (s ? s.split(',').map((t) => t.trim()) : undefined))
      .pipe(z.array(traitKey).min(1, 'Choose at least one trait.').max(20).optional()),
    weights: z
      .string()
      .optional()
      .transform((s) => (s ? s.split(',').map((w) => Number(w.trim())) : undefined))
      .pipe(
        z
          .array(
            z
              .number({ error: 'Each weight must be a number.' })
              .min(0, 'Weights must be zero or more.')
              .max(100, 'Weights must be at most 100.'),
          )
          .optional(),
      ),
    alpha,
    /** The model each trait's means come from; left out, the analysis API's default. */
    model: z.enum(analysisModels).optional(),
  })
  .superRefine((q, ctx) => {
    if (q.weights && !q.traits)
      ctx.addIssue({ code: 'custom', path: ['weights'], message: 'Name the traits too.' });
    if (q.weights && q.traits && q.weights.length !== q.traits.length)
      ctx.addIssue({
        code: 'custom',
        path: ['weights'],
        message: `Give one weight per trait (${q.traits.length}).`,
      });
  });
export type RankingQuery = z.input<typeof rankingQuery>;

export const rankingSchema = z.object({
  traits: z.array(
    z.object({
      key: z.string(),
      label: z.string(),
      direction: z.enum(['higher', 'lower', 'none']),
      weight: z.number(),
      unit: z.string(),
      /** Mean and SD of the entry means (the standardisation). */
      mean: z.number(),
      sd: z.number(),
      varietyP: nullableNumber,
    }),
  ),
  entries: z.array(
    z.object({
      entry: z.string(),
      entryCode: z.string(),
      index: z.number(),
      indexRank: z.number(),
      rankSum: z.number(),
      rankSumRank: z.number(),
      contributions: z.array(
        z.object({
          trait: z.string(),
          mean: z.number(),
          z: z.number(),
          contribution: z.number(),
          rank: z.number().nullable(),
        }),
      ),
    }),
  ),
  method: z.string(),
  warnings: z.array(z.string()),
});
export type Ranking = z.infer<typeof rankingSchema>;

/** Largest spreadsheet the analyze endpoint accepts. */
export const ANALYZE_MAX_BYTES = 2 * 1024 * 1024;

/** A header cell; empty means "the sheet has no such column" (layout roles only). */
const columnName = z.string().trim().max(200);

/**
 * Options for POST /api/analyze (query string with a text/csv body, or beside `csv` in a JSON
 * body). Columns name the header cells to use; left out, the usual names are looked for.
 */
export const analyzeOptions = z.object({
  alpha,
  design: z.enum(designs).optional(),
  letters: z.enum(letterMethods).default('hsd'),
  model: z.enum(analysisModels).default('anova'),
  variety: columnName.optional(),
  site: columnName.optional(),
  block: columnName.optional(),
  plot: columnName.optional(),
  value: columnName.min(1, 'Choose the value column.').optional(),
});
export type AnalyzeOptionsInput = z.input<typeof analyzeOptions>;

export const analyzeJsonBody = analyzeOptions.extend({
  csv: z.string().min(1, 'Paste or upload a spreadsheet.'),
});

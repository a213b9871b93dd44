import { z } from 'zod';

export const trialDesigns = ['crd', 'rcbd', 'multisite', 'incomplete', 'network'] as const;
export const trialStatuses = ['draft', 'active', 'closed', 'published'] as const;
export const entryTypes = ['heirloom', 'open_pollinated', 'hybrid'] as const;
export const quantityKinds = ['mass', 'length', 'count', 'score', 'date', 'percent'] as const;
export const traitBases = ['plant', 'plot', 'harvest'] as const;
export const traitDirections = ['higher', 'lower', 'none'] as const;
/** Units a lead may show a length or mass trait in (US customary readers see in/ft, oz/lb). */
export const traitDisplayUnits = ['mm', 'cm', 'm', 'g', 'kg'] as const;
export type TraitDisplayUnit = (typeof traitDisplayUnits)[number];
export const displayUnitsOfKind = {
  length: ['cm', 'mm', 'm'],
  mass: ['g', 'kg'],
} as const satisfies Record<'length' | 'mass', readonly TraitDisplayUnit[]>;
export const trialRoles = ['lead', 'grower', 'contributor', 'viewer'] as const;

export const designLabels: Record<(typeof trialDesigns)[number], string> = {
  crd: 'Completely randomized',
  rcbd: 'Randomized complete blocks',
  multisite: 'Blocks at several sites',
  incomplete: 'Incomplete blocks (alpha design)',
  network: 'Network of gardens, each growing some entries',
};

/** How a second factor (a treatment) is laid out with the varieties in complete blocks. */
export const factorArrangements = ['factorial', 'split_plot'] as const;
export type FactorArrangement = (typeof factorArrangements)[number];
export const factorArrangementLabels: Record<FactorArrangement, string> = {
  factorial: 'Factorial: every treatment × variety plot in each block',
  split_plot: 'Split plot: treatments on main plots, varieties on subplots',
};
/** Designs whose blocks (or gardens) hold only some of the entries. */
export const incompleteDesigns = ['incomplete', 'network'] as const;
export const isIncompleteDesign = (
  design: (typeof trialDesigns)[number],
): design is (typeof incompleteDesigns)[number] =>
  (incompleteDesigns as readonly string[]).includes(design);

export const trialSlugParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
});

export const trialSummarySchema = z.object({
  id: z.uuid(),
  slug: z.string(),
  title: z.string(),
  crop: z.string(),
  season: z.string(),
  design: z.enum(trialDesigns),
  status: z.enum(trialStatuses),
  siteCount: z.number().int(),
  entryCount: z.number().int(),
  plotCount: z.number().int(),
  myRole: z.enum(trialRoles).nullable(),
});
export type TrialSummary = z.infer<typeof trialSummarySchema>;

export const trialListSchema = z.object({ trials: z.array(trialSummarySchema) });
export type TrialList = z.infer<typeof trialListSchema>;

export const siteSchema = z.object({
  id: z.uuid(),
  name: z.string(),
  region: z.string(),
  soilTexture: z.string().nullable(),
  irrigationMethod: z.string().nullable(),
  notes: z.string(),
});

export const entrySchema = z.object({
  id: z.uuid(),
  name: z.string(),
  code: z.string(),
  seedSource: z.string(),
  entryType: z.enum(entryTypes),
  daysToMaturityClaimed: z.number().int().nullable(),
  notes: z.string(),
  /** The register variety the entry grows (its page is /varieties/<slug>); null outside a group. */
  varietySlug: z.string().nullable(),
});

export const traitSchema = z.object({
  id: z.uuid(),
  key: z.string(),
  label: z.string(),
  quantityKind: z.enum(quantityKinds),
  basis: z.enum(traitBases),
  direction: z.enum(traitDirections),
  scaleMin: z.number().nullable(),
  scaleMax: z.number().nullable(),
  displayUnit: z.enum(traitDisplayUnits).nullable(),
  plausibleMin: z.number().nullable(),
  plausibleMax: z.number().nullable(),
});

export const trialDetailSchema = trialSummarySchema.extend({
  description: z.string(),
  sowingDate: z.string().nullable(),
  transplantDate: z.string().nullable(),
  sites: z.array(siteSchema),
  entries: z.array(entrySchema),
  traits: z.array(traitSchema),
  harvestCount: z.number().int(),
  observationCount: z.number().int(),
  /** The sites a grower is limited to; null when the caller may record at every site. */
  mySiteIds: z.array(z.uuid()).nullable(),
  /** The second factor (a treatment) of a two-factor trial; null for one factor. */
  factor: z
    .object({
      name: z.string(),
      levels: z.array(z.string()),
      arrangement: z.enum(factorArrangements),
    })
    .nullable()
    .optional(),
  /**
   * The trial this one was copied from, if the caller may see it: `view` says where to link
   * (its design page for members, its public results sheet once published).
   */
  copiedFrom: z
    .object({
      slug: z.string(),
      title: z.string(),
      season: z.string(),
      view: z.enum(['trial', 'sheet']),
    })
    .nullable()
    .optional(),
});
export type TrialDetail = z.infer<typeof trialDetailSchema>;

/* DELETE /api/trials/:slug — the address typed again, so a slip of the finger deletes nothing. */
export const deleteTrialBody = z.object({
  confirmSlug: z.string({ error: 'Type the trial address to confirm.' }),
});

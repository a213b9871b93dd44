/**
 * The seed a group keeps and shares: a variety's lots, their germination tests, which lot each
 * trial entry was sown from (with the stand its plots made), and offers of packets to members.
 */
import { z } from 'zod';
import { calendarDate } from '../calendar-date';
import { G_PER_OUNCE } from '../units';
import { typedNumber, blankAsNull } from './typed-input';

/** How a lot's amount is kept: a mass in grams, or a count of seeds. */
export const amountUnits = ['g', 'seeds'] as const;
export type AmountUnit = (typeof amountUnits)[number];
/** What a person types a lot's amount in (ounces are stored as grams). */
export const typedAmountUnits = ['g', 'oz', 'seeds'] as const;
export type TypedAmountUnit = (typeof typedAmountUnits)[number];
export const typedAmountUnitLabels: Record<TypedAmountUnit, string> = {
  g: 'grams',
  oz: 'ounces',
  seeds: 'seeds',
};

/** Why a lot is flagged. */
export const lotWarningKinds = ['untested', 'test_old', 'below_threshold'] as const;
export type LotWarningKind = (typeof lotWarningKinds)[number];

export const offerStatuses = ['open', 'closed'] as const;
export type OfferStatus = (typeof offerStatuses)[number];

export const seedRequestStatuses = ['requested', 'sent', 'declined'] as const;
export type SeedRequestStatus = (typeof seedRequestStatuses)[number];
export const seedRequestStatusLabels: Record<SeedRequestStatus, string> = {
  requested: 'Waiting',
  sent: 'Sent',
  declined: 'Declined',
};
/** What the coordinator answers a request with. */
export const seedRequestAnswers = ['sent', 'declined'] as const;

const text = (max: number, what: string) =>
  z.string().trim().max(max, `Use at most ${max} characters for the ${what}.`);
const required = (max: number, what: string) => text(max, what).min(1, `Enter the ${what}.`);
const whole = (what: string, min: number, max: number) =>
  z
    .number({ error: `${what} must be a whole number.` })
    .int(`${what} must be a whole number.`)
    .min(min, min === 0 ? `${what} cannot be negative.` : `${what} must be at least ${min}.`)
    .max(max, `${what} is implausibly large.`);

const lotId = z.uuid('Not a seed lot id.');
export const lotParams = z.object({ lotId });
export const testParams = z.object({ lotId, testId: z.uuid('Not a germination test id.') });
export const offerParams = z.object({ offerId: z.uuid('Not an offer id.') });
export const seedRequestParams = z.object({ requestId: z.uuid('Not a request id.') });
export const groupParams = z.object({ groupId: z.uuid('Not a group id.') });

/* ---------- Lots ---------- */

const harvestYear = whole('Harvest year', 1900, 2100).nullable();
const amount = z
  .number({ error: 'The amount must be a number.' })
  .refine(Number.isFinite, 'The amount must be a number.')
  .refine((v) => v >= 0, 'The amount cannot be negative.')
  .refine((v) => v <= 100_000_000, 'The amount is implausibly large.')
  .nullable();

const lotFields = {
  label: required(40, 'lot label'),
  source: text(200, 'source'),
  harvestYear,
  amount,
  amountUnit: z.enum(amountUnits, 'Choose grams or seeds.'),
  storagePlace: text(200, 'storage place'),
  notes: text(1000, 'notes'),
};

/** A lot's amount counted in seeds is a whole number (the PATCH checks it against the stored lot). */
export const seedsCountWhole = (b: { amountUnit?: string; amount?: number | null }) =>
  b.amountUnit !== 'seeds' || b.amount == null || Number.isInteger(b.amount);
export const seedsCountMessage = {
  path: ['amount'],
  message: 'A count of seeds is a whole number.',
};

/* POST /api/varieties/:slug/seed/lots (group coordinators) */
export const createLotBody = z
  .object({
    ...lotFields,
    source: lotFields.source.default(''),
    harvestYear: lotFields.harvestYear.default(null),
    amount: lotFields.amount.default(null),
    storagePlace: lotFields.storagePlace.default(''),
    notes: lotFields.notes.default(''),
  })
  .refine(seedsCountWhole, seedsCountMessage);
export type CreateLotBody = z.input<typeof createLotBody>;

/* PATCH /api/seed/lots/:lotId: only the fields sent change. */
export const updateLotBody = z
  .object(lotFields)
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.')
  .refine(seedsCountWhole, seedsCountMessage);
export type UpdateLotBody = z.input<typeof updateLotBody>;

/** The lot form: numbers typed as text, the amount in grams, ounces or seeds. */
export const lotForm = z
  .object({
    label: lotFields.label,
    source: lotFields.source,
    harvestYear: typedNumber(harvestYear, { blank: null }),
    amount: typedNumber(amount, { blank: null }),
    amountUnit: z.enum(typedAmountUnits, 'Choose grams, ounces or seeds.'),
    storagePlace: lotFields.storagePlace,
    notes: lotFields.notes,
  })
  .refine(seedsCountWhole, seedsCountMessage)
  .transform(({ amountUnit, amount, ...rest }) => ({
    ...rest,
    // Ounces are kept as grams, rounded to a tenth of a gram (a packet scale's step).
    amount:
      amount === null || amountUnit !== 'oz' ? amount : Math.round(amount * G_PER_OUNCE * 10) / 10,
    amountUnit: amountUnit === 'seeds' ? ('seeds' as const) : ('g' as const),
  }));
export type LotFormValues = z.input<typeof lotForm>;

/* ---------- Germination tests ---------- */

const testFields = {
  testedOn: calendarDate(),
  seedsTested: whole('Seeds tested', 1, 100_000),
  seedsGerminated: whole('Seeds germinated', 0, 100_000),
  days: whole('Days', 1, 120),
  notes: text(500, 'notes'),
};
const germinatedWithinTested = <T extends { seedsTested: number; seedsGerminated: number }>(b: T) =>
  b.seedsGerminated <= b.seedsTested;
const germinatedMessage = {
  path: ['seedsGerminated'],
  message: 'More seeds cannot germinate than were tested.',
};

/* POST /api/seed/lots/:lotId/tests (group coordinators) */
export const germinationTestBody = z
  .object({ ...testFields, notes: testFields.notes.default('') })
  .refine(germinatedWithinTested, germinatedMessage);
export type GerminationTestBody = z.input<typeof germinationTestBody>;

export const germinationTestForm = z
  .object({
    testedOn: testFields.testedOn,
    seedsTested: typedNumber(testFields.seedsTested),
    seedsGerminated: typedNumber(testFields.seedsGerminated),
    days: typedNumber(testFields.days),
    notes: testFields.notes,
  })
  .refine(germinatedWithinTested, germinatedMessage);
export type GerminationTestFormValues = z.input<typeof germinationTestForm>;

export const germinationTestSchema = z.object({
  id: z.uuid(),
  testedOn: z.string(),
  seedsTested: z.number().int(),
  seedsGerminated: z.number().int(),
  days: z.number().int(),
  notes: z.string(),
  /** Germinated ÷ tested, with its 95 % Wilson score interval, in percent. */
  percent: z.number(),
  lowerPercent: z.number(),
  upperPercent: z.number(),
});
export type GerminationTest = z.infer<typeof germinationTestSchema>;

/* ---------- The group's seed settings ---------- */

const settingsFields = {
  germinationThresholdPercent: whole('The germination threshold', 0, 100),
  requestsOpen: z.boolean({ error: 'Say whether anyone with a confirmed e-mail may ask.' }),
};
/* PATCH /api/seed/groups/:groupId/settings (group coordinators) */
export const seedSettingsBody = z
  .object(settingsFields)
  .partial()
  .refine((b) => Object.keys(b).length > 0, 'Change at least one setting.');
export const seedSettingsForm = z.object({
  germinationThresholdPercent: typedNumber(settingsFields.germinationThresholdPercent),
  requestsOpen: settingsFields.requestsOpen,
});
export type SeedSettingsFormValues = z.input<typeof seedSettingsForm>;
export const seedSettingsSchema = z.object(settingsFields);
export type SeedSettings = z.infer<typeof seedSettingsSchema>;

/* ---------- A variety's seed: GET /api/varieties/:slug/seed ---------- */

export const standPlotSchema = z.object({
  site: z.string(),
  plotNumber: z.number().int(),
  plantsSet: z.number().int().nullable(),
  plantsSurviving: z.number().int().nullable(),
});

/** A trial entry sown from the lot, with the stand counts recorded on its plots. */
export const sownEntrySchema = z.object({
  trialSlug: z.string(),
  trialTitle: z.string(),
  season: z.string(),
  sowingDate: z.string().nullable(),
  entryName: z.string(),
  plots: z.array(standPlotSchema),
  /** Plants surviving ÷ plants set over the plots with both counts, in percent; null without. */
  standPercent: z.number().nullable(),
});
export type SownEntry = z.infer<typeof sownEntrySchema>;

export const lotWarningSchema = z.object({ kind: z.enum(lotWarningKinds), message: z.string() });
export type LotWarning = z.infer<typeof lotWarningSchema>;

export const seedLotSchema = z.object({
  id: z.uuid(),
  label: z.string(),
  source: z.string(),
  harvestYear: z.number().int().nullable(),
  amount: z.number().nullable(),
  amountUnit: z.enum(amountUnits),
  storagePlace: z.string(),
  notes: z.string(),
  /** Newest first. */
  tests: z.array(germinationTestSchema),
  warnings: z.array(lotWarningSchema),
  sown: z.array(sownEntrySchema),
});
export type SeedLot = z.infer<typeof seedLotSchema>;

export const offerSummarySchema = z.object({
  id: z.uuid(),
  lotId: z.uuid(),
  lotLabel: z.string(),
  packetsOffered: z.number().int(),
  packetsLeft: z.number().int(),
  note: z.string(),
  status: z.enum(offerStatuses),
  createdAt: z.string(),
});
export type OfferSummary = z.infer<typeof offerSummarySchema>;

export const varietySeedSchema = z.object({
  variety: z.object({ slug: z.string(), name: z.string(), crop: z.string() }),
  group: z.object({ id: z.uuid(), name: z.string() }),
  canEdit: z.boolean(),
  settings: seedSettingsSchema,
  lots: z.array(seedLotSchema),
  /** The open offer, if any, then closed ones, newest first. */
  offers: z.array(offerSummarySchema),
});
export type VarietySeed = z.infer<typeof varietySeedSchema>;

/* ---------- Which lot each trial entry was sown from ---------- */

/* GET /api/trials/:slug/entry-lots */
export const entryLotsSchema = z.object({
  canEdit: z.boolean(),
  entries: z.array(
    z.object({
      entryId: z.uuid(),
      entryName: z.string(),
      entryCode: z.string(),
      variety: z.object({ slug: z.string(), name: z.string() }).nullable(),
      lotId: z.uuid().nullable(),
      /** The variety's lots the caller may choose from (the group's coordinators and members). */
      lots: z.array(
        z.object({ id: z.uuid(), label: z.string(), harvestYear: z.number().int().nullable() }),
      ),
    }),
  ),
});
export type EntryLots = z.infer<typeof entryLotsSchema>;

export const entryLotParams = z.object({
  slug: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
  entryId: z.uuid('Not an entry id.'),
});
/* PUT /api/trials/:slug/entry-lots/:entryId (trial leads) */
export const setEntryLotBody = z.object({
  lotId: blankAsNull(z.uuid('Choose one of this variety’s lots.').nullable()),
});
export type SetEntryLotBody = z.input<typeof setEntryLotBody>;

/* ---------- Offers and requests ---------- */

/* POST /api/varieties/:slug/seed/offers (group coordinators) */
const offerFields = {
  lotId: z.uuid('Choose the lot the packets come from.'),
  packets: whole('Packets', 1, 10_000),
  note: text(1000, 'note'),
};
export const createOfferBody = z.object({ ...offerFields, note: offerFields.note.default('') });
export type CreateOfferBody = z.input<typeof createOfferBody>;
export const offerForm = z.object({
  lotId: offerFields.lotId,
  packets: typedNumber(offerFields.packets),
  note: offerFields.note,
});
export type OfferFormValues = z.input<typeof offerForm>;

/* PATCH /api/seed/offers/:offerId (group coordinators): close an offer. */
export const updateOfferBody = z.object({
  status: z.literal('closed', 'An offer can only be closed.'),
});

/* GET /api/seed/offers/:offerId */
export const offerSchema = z.object({
  id: z.uuid(),
  variety: z.object({ slug: z.string(), name: z.string(), crop: z.string() }),
  group: z.object({ name: z.string() }),
  lot: z.object({
    label: z.string(),
    harvestYear: z.number().int().nullable(),
    /** The lot's newest germination test, if any. */
    lastTest: z
      .object({
        testedOn: z.string(),
        percent: z.number(),
        lowerPercent: z.number(),
        upperPercent: z.number(),
      })
      .nullable(),
  }),
  packetsOffered: z.number().int(),
  packetsLeft: z.number().int(),
  note: z.string(),
  status: z.enum(offerStatuses),
  /** Whether the caller may ask for a packet now, and if not, why. */
  canRequest: z.boolean(),
  whyNot: z.string().nullable(),
  canManage: z.boolean(),
  myRequest: z
    .object({ status: z.enum(seedRequestStatuses), createdAt: z.string(), answer: z.string() })
    .nullable(),
});
export type Offer = z.infer<typeof offerSchema>;

/* GET /api/seed/offers?trial=<slug>: open offers of a published trial's varieties. */
export const trialOffersQuery = z.object({
  trial: z.string().regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'Not a trial address.'),
});
export const trialOfferSchema = z.object({
  id: z.uuid(),
  varietyName: z.string(),
  entryName: z.string(),
  packetsLeft: z.number().int(),
});
export type TrialOffer = z.infer<typeof trialOfferSchema>;
export const trialOffersSchema = z.object({ offers: z.array(trialOfferSchema) });
export type TrialOffers = z.infer<typeof trialOffersSchema>;

/* POST /api/seed/offers/:offerId/requests (members; anyone confirmed when the group allows) */
export const seedRequestBody = z.object({
  shipTo: required(500, 'address to send the packet to'),
  message: text(1000, 'message').default(''),
});
export type SeedRequestBody = z.input<typeof seedRequestBody>;
export const seedRequestForm = z.object({
  shipTo: seedRequestBody.shape.shipTo,
  message: text(1000, 'message'),
});
export type SeedRequestFormValues = z.input<typeof seedRequestForm>;

/* GET /api/seed/offers/:offerId/requests (group coordinators) */
export const seedRequestSchema = z.object({
  id: z.uuid(),
  requester: z.object({ name: z.string(), email: z.string() }),
  shipTo: z.string(),
  message: z.string(),
  status: z.enum(seedRequestStatuses),
  answer: z.string(),
  createdAt: z.string(),
  answeredAt: z.string().nullable(),
});
export type SeedRequest = z.infer<typeof seedRequestSchema>;
export const seedRequestListSchema = z.object({ requests: z.array(seedRequestSchema) });
export type SeedRequestList = z.infer<typeof seedRequestListSchema>;

/* PATCH /api/seed/requests/:requestId (group coordinators): sent or declined, mailed to them. */
export const answerSeedRequestBody = z.object({
  status: z.enum(seedRequestAnswers, 'Choose sent or declined.'),
  answer: text(1000, 'answer').default(''),
});
export type AnswerSeedRequestBody = z.input<typeof answerSeedRequestBody>;

export const createdSchema = z.object({ id: z.uuid() });

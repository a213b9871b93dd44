/**
 * Every query about a trial lives under one root, `['trial', slug, view, …]`, and every write
 * that changes a trial's data awaits `invalidateTrial(queryClient, slug, change)`: the change
 * names what was written, `trialChanges` says which views read it. Keys are built only here.
 */
import { type QueryClient, type QueryKey, useQueryClient } from '@tanstack/react-query';
import { useCallback } from 'react';
import { markTrialWritten } from './trial-writes';

/** The views of a trial, each the third element of its queries' keys. */
export const trialViews = [
  'detail',
  'design',
  'plots',
  'records',
  'completeness',
  'audit',
  'analysis',
  'ranking',
  'comparison',
  'season',
  'weather',
  'photos',
  'members',
  'results',
] as const;
export type TrialView = (typeof trialViews)[number];

const view = (slug: string, v: TrialView) => ['trial', slug, v] as const;

export const trialKeys = {
  /** The list of trials (not under one trial's root: it reads all of them). */
  list: () => ['trials'] as const,
  /** The public index of published sheets (every trial's, none in particular). */
  publishedIndex: (q: object) => ['published-sheets', q] as const,
  /** The layer above single trials: the caller's groups, their registers and each variety. */
  groups: () => ['varieties', 'groups'] as const,
  varieties: () => ['varieties', 'register'] as const,
  variety: (varietySlug: string) => ['varieties', 'variety', varietySlug] as const,
  varietyComparison: (q: object) => ['varieties', 'compare', q] as const,
  varietyStability: (q: object) => ['varieties', 'stability', q] as const,
  root: (slug: string) => ['trial', slug] as const,
  view,
  detail: (slug: string) => view(slug, 'detail'),
  design: (slug: string) => view(slug, 'design'),
  plots: (slug: string) => view(slug, 'plots'),
  harvests: (slug: string, filters: object = {}) =>
    [...view(slug, 'records'), 'harvests', filters] as const,
  observations: (slug: string, filters: object = {}) =>
    [...view(slug, 'records'), 'observations', filters] as const,
  fieldEvents: (slug: string, filters: object = {}) =>
    [...view(slug, 'records'), 'field-events', filters] as const,
  completeness: (slug: string, q: object) => [...view(slug, 'completeness'), q] as const,
  audit: (slug: string, q: object = {}) => [...view(slug, 'audit'), q] as const,
  analysis: (slug: string, q: object) => [...view(slug, 'analysis'), q] as const,
  ranking: (slug: string, q: object) => [...view(slug, 'ranking'), q] as const,
  comparisonTrait: (slug: string, trait: string) =>
    [...view(slug, 'comparison'), 'trait', trait] as const,
  harvestCurve: (slug: string) => [...view(slug, 'comparison'), 'harvest-curve'] as const,
  entrySite: (slug: string, trait: string) =>
    [...view(slug, 'comparison'), 'entry-site', trait] as const,
  season: (slug: string) => view(slug, 'season'),
  weather: (slug: string, siteId: string) => [...view(slug, 'weather'), siteId] as const,
  photos: (slug: string, filters: object = {}) =>
    [...view(slug, 'photos'), 'list', filters] as const,
  photoTagging: (slug: string) => [...view(slug, 'photos'), 'tagging'] as const,
  members: (slug: string) => [...view(slug, 'members'), 'list'] as const,
  invitations: (slug: string) => [...view(slug, 'members'), 'invitations'] as const,
  /** The mail the trial caused (invitations, follow confirmations, results notices). */
  mail: (slug: string, q: object = {}) => [...view(slug, 'members'), 'mail', q] as const,
  sheetDraft: (slug: string) => [...view(slug, 'results'), 'draft'] as const,
  sheetPreview: (slug: string) => [...view(slug, 'results'), 'preview'] as const,
  sheetPhotos: (slug: string) => [...view(slug, 'results'), 'photos'] as const,
  publishedSheet: (slug: string, version: number | 'latest') =>
    [...view(slug, 'results'), 'published', version] as const,
  versions: (slug: string) => [...view(slug, 'results'), 'versions'] as const,
  /** Open offers of seed of the trial's varieties, linked from its sheet. */
  trialOffers: (slug: string) => [...view(slug, 'results'), 'seed-offers'] as const,
  /** The lot each entry was sown from (entries are the design's). */
  entryLots: (slug: string) => [...view(slug, 'design'), 'entry-lots'] as const,
  /** A group's seed, above single trials: a variety's lots and offers, one offer, its requests. */
  varietySeeds: () => ['varieties', 'seed'] as const,
  varietySeed: (varietySlug: string) => ['varieties', 'seed', varietySlug] as const,
  seedOffers: () => ['seed-offers'] as const,
  seedOffer: (offerId: string) => ['seed-offers', offerId] as const,
  seedRequests: (offerId: string) => ['seed-offers', offerId, 'requests'] as const,
};

/** What a write changed. */
export const trialChangeKinds = [
  /** harvests, observations, field events: logged, edited, deleted, undone, restored, imported */
  'records',
  /** the trial's settings (design, dates, title), entries, sites, traits, layout, planting */
  'design',
  'weather',
  'photos',
  /** the results sheet's draft */
  'sheet',
  /** a version published or withdrawn */
  'publishing',
  'members',
] as const;
export type TrialChange = (typeof trialChangeKinds)[number];

/**
 * Which views read what each kind of write changes. Records feed the counts on the trial's
 * page, the analyses, ranking, comparison, completeness, the season (first harvests) and the
 * sheet's preview; the design changes what everything is computed over.
 */
export const trialChanges: Record<TrialChange, readonly TrialView[]> = {
  records: [
    'detail',
    'records',
    'completeness',
    'audit',
    'analysis',
    'ranking',
    'comparison',
    'season',
    'results',
  ],
  design: trialViews,
  weather: ['season', 'weather', 'results'],
  photos: ['photos', 'results'],
  sheet: ['results'],
  // Publishing queues a notice to each follower (the members page lists the trial's mail).
  publishing: ['detail', 'results', 'members'],
  members: ['detail', 'members'],
};

/** Writes that change what the list of trials shows (titles, counts, status). */
const changesList: ReadonlySet<TrialChange> = new Set(['design', 'publishing']);
/** Writes that change what the variety pages show (figures, entries, photos). */
const changesVarieties: ReadonlySet<TrialChange> = new Set([
  'records',
  'design',
  'photos',
  'publishing',
]);

/** True when `key` is one of `slug`'s queries in one of `views`. */
export const isTrialViewKey = (key: QueryKey, slug: string, views: readonly TrialView[]) =>
  key[0] === 'trial' && key[1] === slug && views.includes(key[2] as TrialView);

/**
 * After a write: marks the views it changed as written on this device (so the on-device copy
 * made before it is never shown again) and awaits their refetch where they are on screen.
 */
export async function invalidateTrial(
  queryClient: QueryClient,
  slug: string,
  change: TrialChange,
): Promise<void> {
  const views = trialChanges[change];
  markTrialWritten(slug, views);
  await queryClient.invalidateQueries({
    predicate: ({ queryKey }) =>
      isTrialViewKey(queryKey, slug, views) ||
      (changesList.has(change) && queryKey[0] === trialKeys.list()[0]) ||
      (changesVarieties.has(change) && queryKey[0] === trialKeys.varieties()[0]),
  });
}

/**
 * What seed writes change. Seed belongs to a group, above single trials: a lot, a germination
 * test, an offer or a request changes the seed pages and offers, and in every trial the entries'
 * lot choices (labels, years) and the open offers its sheet links to.
 */
const seedInTrial = [trialKeys.entryLots('').slice(2), trialKeys.trialOffers('').slice(2)];
const isSeedKey = (key: QueryKey) =>
  (key[0] === trialKeys.varietySeeds()[0] && key[1] === trialKeys.varietySeeds()[1]) ||
  key[0] === trialKeys.seedOffers()[0] ||
  (key[0] === 'trial' && seedInTrial.some(([v, part]) => key[2] === v && key[3] === part));

/**
 * After a seed write: one awaited invalidation of everything `isSeedKey` names. No trial view is
 * marked written (the on-device copy of a trial's design is what the field log needs offline, and
 * a reload asks the server for the lots anyway).
 */
export async function invalidateSeed(queryClient: QueryClient): Promise<void> {
  await queryClient.invalidateQueries({ predicate: ({ queryKey }) => isSeedKey(queryKey) });
}

/** After the trial itself is deleted: everything cached about it goes, and the list refreshes. */
export async function forgetTrial(queryClient: QueryClient, slug: string): Promise<void> {
  markTrialWritten(slug, trialViews);
  queryClient.removeQueries({ queryKey: trialKeys.root(slug) });
  await queryClient.invalidateQueries({ queryKey: trialKeys.list() });
}

/** `invalidateTrial` bound to the app's query client: `await invalidate(slug, 'records')`. */
export function useInvalidateTrial() {
  const queryClient = useQueryClient();
  return useCallback(
    (slug: string, change: TrialChange) => invalidateTrial(queryClient, slug, change),
    [queryClient],
  );
}

/**
 * Fresh numbers after every write: every trial query sits under ['trial', slug], one awaited
 * invalidateTrial reaches each view that reads what was written, and the on-device copy never
 * answers for the server after a reload nor survives a write made on this device.
 */
import {
  dehydrate,
  onlineManager,
  QueryClient,
  QueryClientProvider,
  type QueryKey,
  useQuery,
} from '@tanstack/react-query';
import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import { render, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { rankingQueryOptions } from '../../src/features/analysis/api/get-ranking';
import { seasonQueryOptions } from '../../src/features/analysis/api/get-season';
import { trialAnalysisQueryOptions } from '../../src/features/analysis/api/get-trial-analysis';
import { designQueryOptions } from '../../src/features/design/api/get-design';
import { fieldEventsQueryOptions } from '../../src/features/field-log/api/get-field-events';
import { recordPlotsQueryOptions } from '../../src/features/field-log/api/get-record-plots';
import { invitationsQueryOptions } from '../../src/features/members/api/invitations';
import { membersQueryOptions } from '../../src/features/members/api/get-members';
import { photoTaggingQueryOptions } from '../../src/features/photos/api/get-photo-tagging';
import { photosQueryOptions } from '../../src/features/photos/api/get-photos';
import {
  auditQueryOptions,
  completenessQueryOptions,
  harvestsQueryOptions,
  observationsQueryOptions,
} from '../../src/features/records/api/record-api';
import { traitAnalysisQueryOptions } from '../../src/features/results/api/comparison';
import { trialPhotosQueryOptions } from '../../src/features/results/api/get-entry-photos';
import { publishedSheetQueryOptions } from '../../src/features/results/api/get-published-sheet';
import { versionsQueryOptions } from '../../src/features/results/api/get-versions';
import {
  sheetDraftQueryOptions,
  sheetPreviewQueryOptions,
} from '../../src/features/results/api/sheet-draft';
import { afterCacheRestored, cachePersistOptions } from '../../src/lib/persisted-cache';
import { CACHE_STORAGE_KEY } from '../../src/lib/query-client';
import { trialQueryOptions } from '../../src/lib/trial';
import {
  forgetTrial,
  invalidateTrial,
  trialChanges,
  trialKeys,
  trialViews,
} from '../../src/lib/trial-keys';
import { readTrialWrites } from '../../src/lib/trial-writes';

const slug = 'larkmead-beans';
const analysisQuery = {
  trait: 'yield',
  basis: 'plot' as const,
  alpha: 0.05,
  letters: 'hsd' as const,
  model: 'anova' as const,
};

/** Every query the features make about one trial, by the features' own queryOptions. */
const featureKeys = (s: string): QueryKey[] => [
  trialQueryOptions(s).queryKey,
  designQueryOptions(s).queryKey,
  recordPlotsQueryOptions(s).queryKey,
  fieldEventsQueryOptions(s, 'site-1').queryKey,
  harvestsQueryOptions(s, {}).queryKey,
  observationsQueryOptions(s, {}).queryKey,
  completenessQueryOptions(s, { from: '2026-06-01', to: '2026-09-30' }).queryKey,
  auditQueryOptions(s, {}).queryKey,
  trialAnalysisQueryOptions(s, analysisQuery).queryKey,
  rankingQueryOptions(s, { traits: ['yield'], weights: [1], alpha: 0.05, model: 'anova' }).queryKey,
  traitAnalysisQueryOptions(s, 'yield').queryKey,
  seasonQueryOptions(s).queryKey,
  photosQueryOptions(s, {}).queryKey,
  photoTaggingQueryOptions(s).queryKey,
  membersQueryOptions(s).queryKey,
  invitationsQueryOptions(s).queryKey,
  sheetDraftQueryOptions(s).queryKey,
  sheetPreviewQueryOptions(s).queryKey,
  trialPhotosQueryOptions(s).queryKey,
  publishedSheetQueryOptions(s).queryKey,
  versionsQueryOptions(s).queryKey,
];

/** A query client holding one answer per key, each counting how often it was asked. */
function seeded(keys: QueryKey[]) {
  const client = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: 30_000 } },
  });
  const asked = new Map<string, number>();
  for (const key of keys) {
    const hash = JSON.stringify(key);
    client.setQueryDefaults(key, {
      queryFn: () => {
        asked.set(hash, (asked.get(hash) ?? 0) + 1);
        return { answer: asked.get(hash) };
      },
    });
    client.setQueryData(key, { answer: 0 });
  }
  return { client, asked: (key: QueryKey) => asked.get(JSON.stringify(key)) ?? 0 };
}

beforeEach(() => localStorage.clear());
afterEach(() => onlineManager.setOnline(true));

describe('trial query keys', () => {
  it('every feature query about a trial is rooted at ["trial", slug, view]', () => {
    for (const key of featureKeys(slug)) {
      expect(key.slice(0, 2)).toEqual(['trial', slug]);
      expect(trialViews).toContain(key[2]);
    }
  });
});

describe('invalidateTrial', () => {
  it('a logged harvest refetches the analysis on screen before it resolves, and marks the other views that read records out of date', async () => {
    const other = 'sallowby-squash';
    const keys = [...featureKeys(slug), ...featureKeys(other)];
    const { client, asked } = seeded(keys);
    const analysisKey = trialKeys.analysis(slug, analysisQuery);
    // The analysis is on screen; everything else is only cached.
    const { unmount } = render(<Shows client={client} queryKey={analysisKey} />);
    await screen.findByText('answer 0');

    await invalidateTrial(client, slug, 'records');
    // Awaited: the new answer is already in the cache when the write's handler goes on.
    expect(asked(analysisKey)).toBe(1);
    expect(client.getQueryData(analysisKey)).toEqual({ answer: 1 });
    await screen.findByText('answer 1');
    unmount();

    const reading = new Set(trialChanges.records);
    // The rest wait, out of date, for whoever opens them next.
    for (const key of featureKeys(slug)) {
      if (JSON.stringify(key) === JSON.stringify(analysisKey)) continue;
      const state = client.getQueryState(key)!;
      expect({ key, invalidated: state.isInvalidated }).toEqual({
        key,
        invalidated: reading.has(key[2] as never),
      });
    }
    // Views that records do not feed (the plots the field log needs offline) keep their copy.
    expect(client.getQueryState(trialKeys.plots(slug))!.isInvalidated).toBe(false);
    expect(client.getQueryState(trialKeys.design(slug))!.isInvalidated).toBe(false);
    // Another trial is untouched.
    for (const key of featureKeys(other))
      expect(client.getQueryState(key)!.isInvalidated).toBe(false);
  });

  it('reaches the analysis, comparison, ranking, completeness, season and results views after a records write', () => {
    expect(trialChanges.records).toEqual(
      expect.arrayContaining([
        'analysis',
        'comparison',
        'ranking',
        'completeness',
        'season',
        'results',
      ]),
    );
  });

  it('a design change reaches every view of the trial and the list of trials', async () => {
    const { client } = seeded([...featureKeys(slug), trialKeys.list()]);
    await invalidateTrial(client, slug, 'design');
    for (const key of [...featureKeys(slug), trialKeys.list()])
      expect(client.getQueryState(key)!.isInvalidated).toBe(true);
  });

  it('weather reaches the season and the sheet, not the records or the analysis', async () => {
    const { client } = seeded(featureKeys(slug));
    await invalidateTrial(client, slug, 'weather');
    expect(client.getQueryState(trialKeys.season(slug))!.isInvalidated).toBe(true);
    expect(client.getQueryState(trialKeys.sheetPreview(slug))!.isInvalidated).toBe(true);
    expect(client.getQueryState(trialKeys.harvests(slug))!.isInvalidated).toBe(false);
    expect(client.getQueryState(trialKeys.analysis(slug, analysisQuery))!.isInvalidated).toBe(
      false,
    );
  });

  it('publishing refreshes the published sheet, the list of trials and the trial’s mail', async () => {
    const { client } = seeded([...featureKeys(slug), trialKeys.list(), trialKeys.mail(slug)]);
    await invalidateTrial(client, slug, 'publishing');
    // A publish queues a notice to each follower.
    expect(client.getQueryState(trialKeys.mail(slug))!.isInvalidated).toBe(true);
    expect(client.getQueryState(trialKeys.publishedSheet(slug, 'latest'))!.isInvalidated).toBe(
      true,
    );
    expect(client.getQueryState(trialKeys.list())!.isInvalidated).toBe(true);
  });

  it('records the write on this device, per view', async () => {
    const { client } = seeded(featureKeys(slug));
    const before = Date.now();
    await invalidateTrial(client, slug, 'photos');
    const marks = readTrialWrites(localStorage)[slug]!;
    expect(Object.keys(marks).sort()).toEqual(['photos', 'results']);
    expect(marks.photos).toBeGreaterThanOrEqual(before);
  });

  it('a deleted trial leaves nothing cached', async () => {
    const { client } = seeded([...featureKeys(slug), trialKeys.list()]);
    await forgetTrial(client, slug);
    for (const key of featureKeys(slug)) expect(client.getQueryState(key)).toBeUndefined();
    expect(client.getQueryState(trialKeys.list())!.isInvalidated).toBe(true);
  });
});

function Shows({ client, queryKey }: { client: QueryClient; queryKey: QueryKey }) {
  return (
    <QueryClientProvider client={client}>
      <Answer queryKey={queryKey} />
    </QueryClientProvider>
  );
}

function Answer({ queryKey }: { queryKey: QueryKey }) {
  const { data } = useQuery<{ answer: number | string }>({ queryKey });
  return <p>{data ? `answer ${data.answer}` : 'nothing yet'}</p>;
}

describe('the on-device copy', () => {
  const analysisKey = trialKeys.analysis(slug, analysisQuery);
  const plotsKey = trialKeys.plots(slug);

  /** What a tab saved: the analysis and the plots, both read `ageMs` ago. */
  function storeCopy(ageMs: number) {
    const tab = new QueryClient();
    const readAt = Date.now() - ageMs;
    tab.setQueryData(analysisKey, { answer: 'stored grand mean' }, { updatedAt: readAt });
    tab.setQueryData(plotsKey, { answer: 'stored plots' }, { updatedAt: readAt });
    localStorage.setItem(
      CACHE_STORAGE_KEY,
      JSON.stringify({ timestamp: Date.now(), buster: 'test', clientState: dehydrate(tab) }),
    );
  }

  /** A reload: a new client restoring from localStorage, with the analysis on screen. */
  function reload(server: () => string) {
    const client = new QueryClient({
      defaultOptions: { queries: { retry: false, staleTime: 30_000 } },
    });
    let asked = 0;
    client.setQueryDefaults(analysisKey, {
      queryFn: async () => {
        asked += 1;
        return { answer: server() };
      },
    });
    render(
      <PersistQueryClientProvider
        client={client}
        persistOptions={cachePersistOptions(localStorage, 'test')}
        onSuccess={() => afterCacheRestored(client)}
      >
        <Answer queryKey={analysisKey} />
      </PersistQueryClientProvider>,
    );
    return { client, asked: () => asked };
  }

  it('a reload asks the server even when the stored copy is seconds old', async () => {
    storeCopy(2_000);
    const { asked } = reload(() => 'grand mean with the other grower’s harvest');
    await screen.findByText('answer grand mean with the other grower’s harvest');
    expect(asked()).toBe(1);
  });

  it('with no signal the stored copy shows, and the server is asked when the signal returns', async () => {
    storeCopy(2_000);
    onlineManager.setOnline(false);
    const { asked } = reload(() => 'fresh grand mean');
    await screen.findByText('answer stored grand mean');
    expect(asked()).toBe(0);
    onlineManager.setOnline(true);
    await screen.findByText('answer fresh grand mean');
    expect(asked()).toBe(1);
  });

  it('a copy read before this device’s last write to that view is never restored', async () => {
    storeCopy(2_000);
    // A harvest sent since the copy was read.
    await invalidateTrial(new QueryClient(), slug, 'records');
    onlineManager.setOnline(false);
    const { client } = reload(() => 'unused');
    // The plots do not depend on records: the field log still has them with no signal.
    await waitFor(() => expect(client.getQueryData(plotsKey)).toEqual({ answer: 'stored plots' }));
    expect(client.getQueryData(analysisKey)).toBeUndefined();
    expect(screen.getByText('nothing yet')).toBeTruthy();
  });
});

import { trialAnalysisSchema } from '@common/contracts/analysis';
import { entrySiteSchema, harvestCurveSchema } from '@common/contracts/comparison';
import { queryOptions, useQueries, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const comparisonKeys = {
  all: (slug: string) => ['comparison', slug] as const,
  trait: (slug: string, trait: string) => [...comparisonKeys.all(slug), 'trait', trait] as const,
  curve: (slug: string) => [...comparisonKeys.all(slug), 'curve'] as const,
  entrySite: (slug: string, trait: string) =>
    [...comparisonKeys.all(slug), 'entry-site', trait] as const,
};

const t = (slug: string) => `/api/trials/${encodeURIComponent(slug)}`;

/** One trait's analysis, exactly as the analysis API gives it (nothing is recomputed here). */
export const traitAnalysisQueryOptions = (slug: string, trait: string) =>
  queryOptions({
    queryKey: comparisonKeys.trait(slug, trait),
    queryFn: () => api(`${t(slug)}/analysis`, trialAnalysisSchema, { query: { trait } }),
  });

export const useTraitAnalyses = (slug: string, traits: string[]) =>
  useQueries({ queries: traits.map((trait) => traitAnalysisQueryOptions(slug, trait)) });

export const useHarvestCurve = (slug: string) =>
  useQuery({
    queryKey: comparisonKeys.curve(slug),
    queryFn: () => api(`${t(slug)}/comparison/harvest-curve`, harvestCurveSchema),
  });

export const useEntrySite = (slug: string, trait: string, enabled: boolean) =>
  useQuery({
    queryKey: comparisonKeys.entrySite(slug, trait),
    queryFn: () => api(`${t(slug)}/comparison/entry-site`, entrySiteSchema, { query: { trait } }),
    enabled,
  });

import { trialAnalysisSchema } from '@common/contracts/analysis';
import { entrySiteSchema, harvestCurveSchema } from '@common/contracts/comparison';
import { queryOptions, useQueries, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

const t = (slug: string) => `/api/trials/${encodeURIComponent(slug)}`;

/** One trait's analysis, exactly as the analysis API gives it (nothing is recomputed here). */
export const traitAnalysisQueryOptions = (slug: string, trait: string) =>
  queryOptions({
    queryKey: trialKeys.comparisonTrait(slug, trait),
    queryFn: () => api(`${t(slug)}/analysis`, trialAnalysisSchema, { query: { trait } }),
  });

export const useTraitAnalyses = (slug: string, traits: string[]) =>
  useQueries({ queries: traits.map((trait) => traitAnalysisQueryOptions(slug, trait)) });

export const useHarvestCurve = (slug: string) =>
  useQuery({
    queryKey: trialKeys.harvestCurve(slug),
    queryFn: () => api(`${t(slug)}/comparison/harvest-curve`, harvestCurveSchema),
  });

export const useEntrySite = (slug: string, trait: string, enabled: boolean) =>
  useQuery({
    queryKey: trialKeys.entrySite(slug, trait),
    queryFn: () => api(`${t(slug)}/comparison/entry-site`, entrySiteSchema, { query: { trait } }),
    enabled,
  });

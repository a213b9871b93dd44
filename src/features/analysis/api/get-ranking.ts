import { rankingSchema, type AnalysisModel } from '@common/contracts/analysis';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export interface RankingParams {
  traits: string[];
  weights: number[];
  alpha: number;
  /** Left out, each trait's means come from the model the analysis API chooses for it. */
  model?: AnalysisModel;
}

export const getRanking = (slug: string, q: RankingParams) =>
  api(`/api/trials/${encodeURIComponent(slug)}/ranking`, rankingSchema, {
    query: {
      traits: q.traits.join(','),
      weights: q.weights.join(','),
      alpha: q.alpha,
      model: q.model,
    },
  });

export const rankingQueryOptions = (slug: string, q: RankingParams) =>
  queryOptions({
    queryKey: trialKeys.ranking(slug, q),
    queryFn: () => getRanking(slug, q),
    enabled: q.traits.length > 0,
    placeholderData: keepPreviousData,
  });

export const useRanking = (slug: string, q: RankingParams) =>
  useQuery(rankingQueryOptions(slug, q));

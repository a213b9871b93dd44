import {
  type AnalysisBasis,
  type AnalysisModel,
  trialAnalysisSchema,
} from '@common/contracts/analysis';
import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export interface TrialAnalysisParams {
  trait: string;
  basis: AnalysisBasis;
  alpha: number;
  letters: 'hsd' | 'lsd';
  /** Left out: the server chooses (a split plot that lost plots takes the mixed model). */
  model: AnalysisModel | undefined;
  /** Mixed model only: also fit varieties as random (heritability, BLUPs). */
  varietiesRandom?: boolean;
}

export const getTrialAnalysis = (slug: string, q: TrialAnalysisParams) =>
  api(`/api/trials/${encodeURIComponent(slug)}/analysis`, trialAnalysisSchema, {
    query: {
      trait: q.trait,
      basis: q.basis,
      alpha: q.alpha,
      letters: q.letters,
      model: q.model,
      ...(q.varietiesRandom ? { varietiesRandom: 'true' } : {}),
    },
  });

export const trialAnalysisQueryOptions = (slug: string, q: TrialAnalysisParams) =>
  queryOptions({
    queryKey: trialKeys.analysis(slug, q),
    queryFn: () => getTrialAnalysis(slug, q),
    enabled: q.trait !== '',
    placeholderData: keepPreviousData,
  });

export const useTrialAnalysis = (slug: string, q: TrialAnalysisParams) =>
  useQuery(trialAnalysisQueryOptions(slug, q));

import { comparisonSchema } from '@common/contracts/varieties';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/varieties/compare: chosen varieties side by side on one trait. */
export const compareVarieties = (varieties: string[], trait: string | undefined) =>
  api('/api/varieties/compare', comparisonSchema, {
    query: { varieties: varieties.join(','), trait },
  });

export const useVarietyComparison = (varieties: string[], trait: string | undefined) =>
  useQuery({
    queryKey: trialKeys.varietyComparison({ varieties, trait }),
    queryFn: () => compareVarieties(varieties, trait),
    enabled: varieties.length >= 2,
    placeholderData: keepPreviousData,
  });

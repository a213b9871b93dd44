import { varietyListSchema } from '@common/contracts/varieties';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/varieties: the registers of the caller's groups, with trial and season counts. */
export const getVarieties = () => api('/api/varieties', varietyListSchema);

export const varietiesQueryOptions = () =>
  queryOptions({ queryKey: trialKeys.varieties(), queryFn: getVarieties });

export const useVarieties = (enabled = true) => useQuery({ ...varietiesQueryOptions(), enabled });

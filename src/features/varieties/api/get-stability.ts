import { stabilitySchema } from '@common/contracts/varieties';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

/** GET /api/varieties/stability: a crop's register varieties across environments, one trait. */
export const getStability = (group: string, crop: string, trait: string | undefined) =>
  api('/api/varieties/stability', stabilitySchema, { query: { group, crop, trait } });

export const useStability = (group: string, crop: string, trait: string | undefined) =>
  useQuery({
    queryKey: trialKeys.varietyStability({ group, crop, trait }),
    queryFn: () => getStability(group, crop, trait),
    enabled: Boolean(group && crop),
    placeholderData: keepPreviousData,
  });

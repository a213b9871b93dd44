import { trialListSchema } from '@common/contracts/trials';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getTrials = () => api('/api/trials', trialListSchema);

export const trialsQueryOptions = () =>
  queryOptions({ queryKey: trialKeys.list(), queryFn: getTrials });

export const useTrials = () => useQuery(trialsQueryOptions());

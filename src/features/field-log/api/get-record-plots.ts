import { recordPlotListSchema } from '@common/contracts/records';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getRecordPlots = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/records/plots`, recordPlotListSchema);

/** Every plot of the trial; kept a day so the field log still works with no signal. */
export const recordPlotsQueryOptions = (slug: string) =>
  queryOptions({
    queryKey: trialKeys.plots(slug),
    queryFn: () => getRecordPlots(slug),
    staleTime: 5 * 60_000,
    gcTime: 24 * 60 * 60_000,
  });

export const useRecordPlots = (slug: string) => useQuery(recordPlotsQueryOptions(slug));

import { fieldEventListSchema } from '@common/contracts/records';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const getFieldEvents = (slug: string, siteId?: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}/field-events`, fieldEventListSchema, {
    query: { siteId },
  });

export const fieldEventsQueryOptions = (slug: string, siteId?: string) =>
  queryOptions({
    queryKey: trialKeys.fieldEvents(slug, { siteId }),
    queryFn: () => getFieldEvents(slug, siteId),
  });

export const useFieldEvents = (slug: string, siteId?: string) =>
  useQuery({ ...fieldEventsQueryOptions(slug, siteId), enabled: Boolean(siteId) });

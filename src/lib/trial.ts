import { trialDetailSchema } from '@common/contracts/trials';
import { trialActions } from '@common/policy';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from './api-client';

/**
 * The trials' query keys, shared: every feature reads a trial through this module and
 * refreshes the list or a trial's detail after changing what they show.
 */
export const trialKeys = {
  all: ['trials'] as const,
  list: () => [...trialKeys.all, 'list'] as const,
  detail: (slug: string) => [...trialKeys.all, 'detail', slug] as const,
};

const responseSchema = trialDetailSchema.extend({
  permissions: z.record(z.enum(trialActions), z.boolean()),
});
export type TrialWithPermissions = z.infer<typeof responseSchema>;

export const getTrial = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}`, responseSchema);

export const trialQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.detail(slug), queryFn: () => getTrial(slug) });

export const useTrial = (slug: string) => useQuery(trialQueryOptions(slug));

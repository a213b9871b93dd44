import { trialDetailSchema } from '@common/contracts/trials';
import { trialActions } from '@common/policy';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from './api-client';
import { trialKeys } from './trial-keys';

const responseSchema = trialDetailSchema.extend({
  permissions: z.record(z.enum(trialActions), z.boolean()),
});
export type TrialWithPermissions = z.infer<typeof responseSchema>;

export const getTrial = (slug: string) =>
  api(`/api/trials/${encodeURIComponent(slug)}`, responseSchema);

export const trialQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.detail(slug), queryFn: () => getTrial(slug) });

export const useTrial = (slug: string) => useQuery(trialQueryOptions(slug));

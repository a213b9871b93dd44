/**
 * The records tables' API: lists, edits with the version read, delete and undo, completeness,
 * import and the audit log. Mutations await `invalidateTrial(slug, 'records')`.
 */
import {
  auditListSchema,
  completenessSchema,
  type ConflictDetails,
  conflictDetailsSchema,
  harvestListSchema,
  harvestLogQuery,
  type HarvestLogQuery,
  harvestSchema,
  importPreviewSchema,
  importResultSchema,
  type ImportKind,
  observationListSchema,
  observationLogQuery,
  type ObservationLogQuery,
  observationSchema,
  restoredSchema,
  type RestoreBody,
  type UpdateHarvestBody,
  type UpdateObservationBody,
} from '@common/contracts/records';
import { queryOptions, useMutation, useQuery } from '@tanstack/react-query';
import { api, ApiError } from '@/lib/api-client';
import { trialKeys, useInvalidateTrial } from '@/lib/trial-keys';

const base = (slug: string) => `/api/trials/${encodeURIComponent(slug)}`;

/** One page of the harvest log; the query is read by the endpoint's own contract first. */
export const getHarvests = (slug: string, q: HarvestLogQuery) =>
  api(`${base(slug)}/harvests`, harvestListSchema, { query: harvestLogQuery.parse(q) });
export const harvestsQueryOptions = (slug: string, q: HarvestLogQuery) => ({
  queryKey: trialKeys.harvests(slug, q),
  queryFn: () => getHarvests(slug, q),
});

/** One page of the observation log. */
export const getObservations = (slug: string, q: ObservationLogQuery) =>
  api(`${base(slug)}/observations`, observationListSchema, {
    query: observationLogQuery.parse(q),
  });
export const observationsQueryOptions = (slug: string, q: ObservationLogQuery) => ({
  queryKey: trialKeys.observations(slug, q),
  queryFn: () => getObservations(slug, q),
});

export const completenessQueryOptions = (
  slug: string,
  q: { siteId?: string; from: string; to: string },
) =>
  queryOptions({
    queryKey: trialKeys.completeness(slug, q),
    queryFn: () => api(`${base(slug)}/records/completeness`, completenessSchema, { query: q }),
  });
export const useCompleteness = (slug: string, q: { siteId?: string; from: string; to: string }) =>
  useQuery(completenessQueryOptions(slug, q));

export const auditQueryOptions = (slug: string, q: { table?: string; action?: string }) =>
  queryOptions({
    queryKey: trialKeys.audit(slug, q),
    queryFn: () => api(`${base(slug)}/audit`, auditListSchema, { query: { ...q, limit: 200 } }),
  });
export const useAuditLog = (slug: string, q: { table?: string; action?: string }) =>
  useQuery(auditQueryOptions(slug, q));

/** The 409 details of a stale save, or null for any other failure. */
export function conflictOf(error: unknown): ConflictDetails | null {
  if (!(error instanceof ApiError) || error.status !== 409) return null;
  const parsed = conflictDetailsSchema.safeParse(error.details);
  return parsed.success ? parsed.data : null;
}

function useRecordMutation<TVars, TOut>(slug: string, fn: (v: TVars) => Promise<TOut>) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: fn,
    // Also after a refusal: a 409 means someone else changed the records meanwhile.
    onSettled: () => invalidate(slug, 'records'),
  });
}

export const useUpdateHarvest = (slug: string) =>
  useRecordMutation(slug, ({ id, body }: { id: string; body: UpdateHarvestBody }) =>
    api(`${base(slug)}/harvests/${id}`, harvestSchema, { method: 'PATCH', body }),
  );
export const useUpdateObservation = (slug: string) =>
  useRecordMutation(slug, ({ id, body }: { id: string; body: UpdateObservationBody }) =>
    api(`${base(slug)}/observations/${id}`, observationSchema, { method: 'PATCH', body }),
  );

type Path = 'harvests' | 'observations' | 'field-events';
export const useDeleteRecord = (slug: string, path: Path) =>
  useRecordMutation(slug, (id: string) =>
    api(`${base(slug)}/${path}/${id}`, null, { method: 'DELETE' }),
  );
export const useUndoDelete = (slug: string, path: Path) =>
  useRecordMutation(slug, (id: string) =>
    api(`${base(slug)}/${path}/${id}/undo-delete`, null, { method: 'POST' }),
  );
export const useRestoreRecord = (slug: string) =>
  useRecordMutation(slug, (body: RestoreBody) =>
    api(`${base(slug)}/audit/restore`, restoredSchema, { method: 'POST', body }),
  );

export const previewImport = (slug: string, kind: ImportKind, csv: string) =>
  api(`${base(slug)}/records/import/preview`, importPreviewSchema, {
    method: 'POST',
    body: { kind, csv },
  });
export const useCommitImport = (slug: string) =>
  useRecordMutation(slug, ({ kind, csv }: { kind: ImportKind; csv: string }) =>
    api(`${base(slug)}/records/import`, importResultSchema, {
      method: 'POST',
      body: { kind, csv },
    }),
  );
export const exportUrl = (slug: string, dataset: string) =>
  `${base(slug)}/records/export/${dataset}`;

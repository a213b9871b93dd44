import {
  type SaveSheetBody,
  resultSnapshotSchema,
  sheetDraftSchema,
} from '@common/contracts/results';
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { invalidateTrial, trialKeys } from '@/lib/trial-keys';

const base = (slug: string) => `/api/trials/${encodeURIComponent(slug)}/results-sheet`;

export const getSheetDraft = (slug: string) => api(base(slug), sheetDraftSchema);
export const sheetDraftQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.sheetDraft(slug), queryFn: () => getSheetDraft(slug) });
export const useSheetDraft = (slug: string) => useQuery(sheetDraftQueryOptions(slug));

export const getSheetPreview = (slug: string) => api(`${base(slug)}/preview`, resultSnapshotSchema);
export const sheetPreviewQueryOptions = (slug: string) =>
  queryOptions({
    queryKey: trialKeys.sheetPreview(slug),
    queryFn: () => getSheetPreview(slug),
    staleTime: 0,
  });
export const useSheetPreview = (slug: string, enabled: boolean) =>
  useQuery({ ...sheetPreviewQueryOptions(slug), enabled });

export function useSaveSheet(slug: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: SaveSheetBody) => api(base(slug), sheetDraftSchema, { method: 'PUT', body }),
    onSuccess: async (draft) => {
      qc.setQueryData(trialKeys.sheetDraft(slug), draft);
      await invalidateTrial(qc, slug, 'sheet');
    },
  });
}

const published = z.object({ version: z.number(), url: z.string() });

export function usePublishSheet(slug: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (changeNote: string) =>
      api(`${base(slug)}/publish`, published, { method: 'POST', body: { changeNote } }),
    onSuccess: () => invalidateTrial(qc, slug, 'publishing'),
  });
}

export function useUnpublishSheet(slug: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>(`${base(slug)}/unpublish`, null, { method: 'POST' }),
    onSuccess: () => invalidateTrial(qc, slug, 'publishing'),
  });
}

import type { CreateVarietyBody, UpdateVarietyBody } from '@common/contracts/varieties';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

const created = z.object({ slug: z.string() });

/** POST /api/varieties (group coordinators). */
export const createVariety = (body: CreateVarietyBody) =>
  api('/api/varieties', created, { method: 'POST', body });

/** PATCH /api/varieties/:slug (group coordinators): only the fields sent change. */
export const updateVariety = (slug: string, body: UpdateVarietyBody) =>
  api(`/api/varieties/${encodeURIComponent(slug)}`, null, { method: 'PATCH', body });

/** Either write; afterwards every register view (lists, records, comparisons) reads again. */
export function useSaveVariety(slug: string | null) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateVarietyBody) => {
      if (slug === null) return createVariety(body);
      const { groupId: _group, ...fields } = body;
      return updateVariety(slug, fields).then(() => ({ slug }));
    },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: [trialKeys.varieties()[0]] }),
  });
}

/** PATCH /api/varieties/:slug with only the cover (null clears it). */
export function useSetVarietyCover(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (coverPhotoId: string | null) => updateVariety(slug, { coverPhotoId }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: [trialKeys.varieties()[0]] }),
  });
}

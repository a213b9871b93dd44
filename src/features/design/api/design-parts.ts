/** Entries, sites and traits: add, edit and remove, each refreshing the design afterwards. */
import type { EntryBody, SiteBody, TraitBody } from '@common/contracts/design';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { invalidateTrial } from '@/lib/trial-keys';

type Part = 'entries' | 'sites' | 'traits';
type BodyOf = { entries: EntryBody; sites: SiteBody; traits: TraitBody };
const created = z.object({ id: z.uuid() });
const base = (slug: string, part: Part) => `/api/trials/${encodeURIComponent(slug)}/${part}`;

export const createPart = <P extends Part>(slug: string, part: P, body: BodyOf[P]) =>
  api(base(slug, part), created, { method: 'POST', body });
export const updatePart = <P extends Part>(
  slug: string,
  part: P,
  id: string,
  body: Partial<BodyOf[P]>,
) => api<void>(`${base(slug, part)}/${id}`, null, { method: 'PATCH', body });
export const deletePart = (slug: string, part: Part, id: string) =>
  api<void>(`${base(slug, part)}/${id}`, null, { method: 'DELETE' });

export function useCreatePart<P extends Part>(slug: string, part: P) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: BodyOf[P]) => createPart(slug, part, body),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

export function useUpdatePart<P extends Part>(slug: string, part: P) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: Partial<BodyOf[P]> }) =>
      updatePart(slug, part, id, body),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

export function useDeletePart(slug: string, part: Part) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => deletePart(slug, part, id),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

/** Adds a new part, or saves the one being edited. */
export function useSavePart<P extends Part>(slug: string, part: P, editingId: string | null) {
  const create = useCreatePart(slug, part);
  const update = useUpdatePart(slug, part);
  return (body: BodyOf[P]): Promise<unknown> =>
    editingId ? update.mutateAsync({ id: editingId, body }) : create.mutateAsync(body);
}

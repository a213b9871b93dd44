import { type TraitUpdateBody, traitUpdateResponse } from '@common/contracts/design';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { invalidateTrial } from '@/lib/trial-keys';

/** PATCH /api/trials/:slug/traits/:id — answers whether the published sheet would change. */
export const updateTrait = (slug: string, id: string, body: TraitUpdateBody) =>
  api(`/api/trials/${encodeURIComponent(slug)}/traits/${id}`, traitUpdateResponse, {
    method: 'PATCH',
    body,
  });

export function useUpdateTrait(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: string; body: TraitUpdateBody }) =>
      updateTrait(slug, id, body),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { forgetTrial } from '@/lib/trial-keys';

export const deleteTrial = (slug: string, confirmSlug: string) =>
  api<void>(`/api/trials/${encodeURIComponent(slug)}`, null, {
    method: 'DELETE',
    body: { confirmSlug },
  });

export function useDeleteTrial(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (confirmSlug: string) => deleteTrial(slug, confirmSlug),
    // Everything cached about the trial is gone with it.
    onSuccess: () => forgetTrial(queryClient, slug),
  });
}

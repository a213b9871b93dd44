import type { UpdateTrialBody } from '@common/contracts/design';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { invalidateTrial } from '@/lib/trial-keys';

export const updateTrial = (slug: string, body: UpdateTrialBody) =>
  api<void>(`/api/trials/${encodeURIComponent(slug)}`, null, { method: 'PATCH', body });

export function useUpdateTrial(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateTrialBody) => updateTrial(slug, body),
    onSuccess: () => invalidateTrial(queryClient, slug, 'design'),
  });
}

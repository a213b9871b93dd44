import { type CopyTrialBody, copyTrialResponse } from '@common/contracts/design';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const copyTrial = (slug: string, body: CopyTrialBody) =>
  api(`/api/trials/${encodeURIComponent(slug)}/copy`, copyTrialResponse, {
    method: 'POST',
    body,
  });

export function useCopyTrial(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CopyTrialBody) => copyTrial(slug, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: trialKeys.list() }),
  });
}

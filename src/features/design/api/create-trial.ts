import { type CreateTrialBody, createTrialResponse } from '@common/contracts/design';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys } from '@/lib/trial-keys';

export const createTrial = (body: CreateTrialBody) =>
  api('/api/trials', createTrialResponse, { method: 'POST', body });

export function useCreateTrial() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createTrial,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: trialKeys.list() }),
  });
}

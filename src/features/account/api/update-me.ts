import { meSchema, type UpdateMeBody } from '@common/contracts/me';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { sessionKeys } from '@/lib/session';

export const updateMe = (body: UpdateMeBody) => api('/api/me', meSchema, { method: 'PATCH', body });

export function useUpdateMe() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMe,
    onSuccess: async (me) => {
      queryClient.setQueryData(sessionKeys.me, me);
      await queryClient.invalidateQueries({ queryKey: sessionKeys.me });
    },
  });
}

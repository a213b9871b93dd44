import { memberSchema, type UpdateMemberBody } from '@common/contracts/members';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { memberKeys } from './member-keys';

const memberUrl = (slug: string, userId: string) =>
  `/api/trials/${encodeURIComponent(slug)}/members/${encodeURIComponent(userId)}`;

export const updateMember = (slug: string, userId: string, body: UpdateMemberBody) =>
  api(memberUrl(slug, userId), memberSchema, { method: 'PATCH', body });

export const removeMember = (slug: string, userId: string) =>
  api(memberUrl(slug, userId), null, { method: 'DELETE' });

export function useUpdateMember(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (v: { userId: string; body: UpdateMemberBody }) =>
      updateMember(slug, v.userId, v.body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.list(slug) }),
  });
}

export function useRemoveMember(slug: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (userId: string) => removeMember(slug, userId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.list(slug) }),
  });
}

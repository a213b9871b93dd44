import { memberSchema, type UpdateMemberBody } from '@common/contracts/members';
import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { useInvalidateTrial } from '@/lib/trial-keys';

const memberUrl = (slug: string, userId: string) =>
  `/api/trials/${encodeURIComponent(slug)}/members/${encodeURIComponent(userId)}`;

export const updateMember = (slug: string, userId: string, body: UpdateMemberBody) =>
  api(memberUrl(slug, userId), memberSchema, { method: 'PATCH', body });

export const removeMember = (slug: string, userId: string) =>
  api(memberUrl(slug, userId), null, { method: 'DELETE' });

export function useUpdateMember(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: (v: { userId: string; body: UpdateMemberBody }) =>
      updateMember(slug, v.userId, v.body),
    onSuccess: () => invalidate(slug, 'members'),
  });
}

export function useRemoveMember(slug: string) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: (userId: string) => removeMember(slug, userId),
    onSuccess: () => invalidate(slug, 'members'),
  });
}

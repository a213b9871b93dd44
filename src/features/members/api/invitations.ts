import {
  type CreateInvitationBody,
  invitationListSchema,
  invitationSchema,
} from '@common/contracts/invitations';
import { queryOptions, useMutation, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { trialKeys, useInvalidateTrial } from '@/lib/trial-keys';

const base = (slug: string) => `/api/trials/${encodeURIComponent(slug)}/invitations`;

export const getInvitations = (slug: string) => api(base(slug), invitationListSchema);

export const invitationsQueryOptions = (slug: string) =>
  queryOptions({ queryKey: trialKeys.invitations(slug), queryFn: () => getInvitations(slug) });

export const useInvitations = (slug: string) => useQuery(invitationsQueryOptions(slug));

export const createInvitation = (slug: string, body: CreateInvitationBody) =>
  api(base(slug), invitationSchema, { method: 'POST', body });
export const resendInvitation = (slug: string, id: string) =>
  api(`${base(slug)}/${id}/resend`, invitationSchema, { method: 'POST' });
export const revokeInvitation = (slug: string, id: string) =>
  api(`${base(slug)}/${id}`, null, { method: 'DELETE' });

function useInvitationMutation<A, R>(slug: string, fn: (a: A) => Promise<R>) {
  const invalidate = useInvalidateTrial();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => invalidate(slug, 'members'),
  });
}

export const useCreateInvitation = (slug: string) =>
  useInvitationMutation(slug, (body: CreateInvitationBody) => createInvitation(slug, body));
export const useResendInvitation = (slug: string) =>
  useInvitationMutation(slug, (id: string) => resendInvitation(slug, id));
export const useRevokeInvitation = (slug: string) =>
  useInvitationMutation(slug, (id: string) => revokeInvitation(slug, id));

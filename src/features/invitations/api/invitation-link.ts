import {
  acceptInvitationResponse,
  type InvitationSignUpBody,
  invitationPreviewSchema,
} from '@common/contracts/invitations';
import { queryOptions, useMutation, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

export const invitationLinkKeys = {
  preview: (token: string) => ['invitation-link', token] as const,
};

export const lookupInvitation = (token: string) =>
  api('/api/invitations/lookup', invitationPreviewSchema, { method: 'POST', body: { token } });

export const invitationPreviewOptions = (token: string) =>
  queryOptions({
    queryKey: invitationLinkKeys.preview(token),
    queryFn: () => lookupInvitation(token),
    enabled: token.length > 0,
    staleTime: Infinity,
  });

export const useInvitationPreview = (token: string) => useQuery(invitationPreviewOptions(token));

export const acceptInvitation = (token: string) =>
  api('/api/invitations/accept', acceptInvitationResponse, { method: 'POST', body: { token } });

export const signUpWithInvitation = (body: InvitationSignUpBody) =>
  api('/api/invitations/sign-up', acceptInvitationResponse, { method: 'POST', body });

/** Joining changes who the person is and what they see: the caller resets the session. */
export const useAcceptInvitation = () => useMutation({ mutationFn: acceptInvitation });
export const useSignUpWithInvitation = () => useMutation({ mutationFn: signUpWithInvitation });

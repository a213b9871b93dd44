import { z } from 'zod';
import { emailSchema, passwordSchema, personNameSchema } from './auth';
import { mailStatuses } from './mail';
import { siteIdsSchema } from './members';
import { trialRoles, trialSlugParams } from './trials';

/** Days an invitation link stays valid. */
export const invitationLifetimeDays = 7;

export const invitationStates = ['pending', 'expired', 'accepted', 'revoked'] as const;

export const invitationParams = trialSlugParams.extend({
  invitationId: z.uuid('Not an invitation id.'),
});

export const createInvitationBody = z
  .object({ email: emailSchema, role: z.enum(trialRoles), siteIds: siteIdsSchema })
  .refine((v) => v.role === 'grower' || v.siteIds.length === 0, {
    path: ['siteIds'],
    message: 'Only growers are limited to sites; leave the sites empty for this role.',
  });
export type CreateInvitationBody = z.infer<typeof createInvitationBody>;

export const invitationSchema = z.object({
  id: z.uuid(),
  email: z.string(),
  role: z.enum(trialRoles),
  siteIds: z.array(z.string()),
  invitedBy: z.string().nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
  state: z.enum(invitationStates),
  lastSentAt: z.string().nullable(),
  sendAttempts: z.number().int(),
  mailStatus: z.enum(mailStatuses),
});
export type Invitation = z.infer<typeof invitationSchema>;

export const invitationListSchema = z.object({ invitations: z.array(invitationSchema) });

/** The token from the link's fragment (base64url of 32 random bytes). */
export const invitationToken = z
  .string()
  .regex(
    /^[A-Za-z0-9_-]{43}$/,
    'This invitation link is incomplete; open it again from the e-mail.',
  );

export const invitationTokenBody = z.object({ token: invitationToken });

export const invitationPreviewSchema = z.object({
  trial: z.object({ slug: z.string(), title: z.string(), crop: z.string() }),
  email: z.string(),
  role: z.enum(trialRoles),
  siteNames: z.array(z.string()),
  invitedBy: z.string().nullable(),
  expiresAt: z.string(),
  state: z.enum(invitationStates),
  accountExists: z.boolean(),
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

export const acceptInvitationResponse = z.object({
  trialSlug: z.string(),
  role: z.enum(trialRoles),
  alreadyMember: z.boolean(),
});

export const invitationSignUpBody = z.object({
  token: invitationToken,
  name: personNameSchema,
  password: passwordSchema,
});
export type InvitationSignUpBody = z.infer<typeof invitationSignUpBody>;

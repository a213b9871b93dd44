import { z } from 'zod';

/** What each queued message is; the database's check lists the same names. */
export const mailKinds = [
  'invitation',
  'password_reset',
  'email_verification',
  'sign_up_attempt',
  'follow_confirmation',
  'publish_notice',
  'seed_request_answer',
  'seed_request_received',
] as const;
export type MailKind = (typeof mailKinds)[number];

export const mailKindLabels: Record<MailKind, string> = {
  invitation: 'Invitation',
  password_reset: 'Password reset',
  email_verification: 'Address confirmation',
  sign_up_attempt: 'Sign-up notice',
  follow_confirmation: 'Follow confirmation',
  publish_notice: 'Results notice',
  seed_request_answer: 'Seed request answer',
  seed_request_received: 'Seed request received',
};

/** pending: queued, not yet accepted by the relay (retried with growing waits); failed: given up. */
export const mailStatuses = ['pending', 'sent', 'failed'] as const;
export type MailStatus = (typeof mailStatuses)[number];

export const trialMailQuery = z.object({
  status: z.enum(mailStatuses).optional(),
});

export const trialMailItem = z.object({
  id: z.uuid(),
  kind: z.enum(mailKinds),
  recipient: z.string(),
  subject: z.string(),
  status: z.enum(mailStatuses),
  attempts: z.number().int(),
  lastError: z.string().nullable(),
  createdAt: z.string(),
  sentAt: z.string().nullable(),
});
export type TrialMailItem = z.infer<typeof trialMailItem>;

/** The newest messages a trial caused, with the count of each status over all of them. */
export const trialMailResponse = z.object({
  mail: z.array(trialMailItem),
  counts: z.object({ pending: z.number().int(), sent: z.number().int(), failed: z.number().int() }),
});
export type TrialMailResponse = z.infer<typeof trialMailResponse>;

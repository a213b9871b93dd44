import { roleDescriptions, roleLabels } from '../../common/contracts/members';
import type { TrialRole } from '../../common/policy';
import { composeMail, type OutgoingMail } from '../mail/mailer';

/** The invitation letter. The token travels in the link's fragment, which browsers never send. */
export function invitationMail(opts: {
  to: string;
  baseUrl: string;
  token: string;
  trialTitle: string;
  inviterName: string | null;
  role: TrialRole;
  siteNames: string[];
  expiresAt: Date;
}): OutgoingMail {
  const until = opts.expiresAt.toLocaleDateString('en-GB', {
    timeZone: 'UTC',
    day: 'numeric',
    month: 'long',
    year: 'numeric',
  });
  const who = opts.inviterName ?? 'A trial lead';
  return composeMail({
    to: opts.to,
    subject: `${who} invites you to “${opts.trialTitle}” on Rowtally`,
    lines: [
      `Hello,`,
      `${who} invites you to join the variety trial “${opts.trialTitle}” on Rowtally as ${roleLabels[opts.role].toLowerCase()}.`,
      `${roleLabels[opts.role]}: ${roleDescriptions[opts.role]}`,
      ...(opts.role === 'grower' && opts.siteNames.length
        ? [`Your sites: ${opts.siteNames.join(', ')}.`]
        : []),
      `The link works once, until ${until} (UTC). Opening it lets you create your account, or sign in to the one you have, and join the trial.`,
      'If you do not know this person or this trial, ignore this message; nothing happens.',
    ],
    action: {
      label: 'Join the trial',
      url: `${opts.baseUrl}/invitations/accept#token=${opts.token}`,
    },
  });
}

import { mailKindLabels, type MailStatus, type TrialMailItem } from '@common/contracts/mail';
import { useId, useState } from 'react';
import { FormMessage } from '@/components/ui/text-field';
import { useTrialMail } from '../api/trial-mail';

const when = (iso: string) =>
  new Date(iso).toLocaleString(undefined, {
    day: 'numeric',
    month: 'short',
    hour: '2-digit',
    minute: '2-digit',
  });

const statusWords: Record<MailStatus, string> = {
  pending: 'Waiting to be sent',
  sent: 'Sent',
  failed: 'Not sent',
};

function outcome(m: TrialMailItem) {
  if (m.status === 'sent' && m.sentAt) return `Sent ${when(m.sentAt)}`;
  if (m.status === 'pending')
    return m.attempts === 0
      ? 'Waiting to be sent'
      : `Waiting: ${m.attempts} ${m.attempts === 1 ? 'try' : 'tries'} so far, trying again later`;
  return `Not sent after ${m.attempts} ${m.attempts === 1 ? 'try' : 'tries'}`;
}

/** What the trial's mail did: queued messages, sent ones, and those given up (with why). */
export function TrialMail({ slug }: { slug: string }) {
  const id = useId();
  const [status, setStatus] = useState<MailStatus | ''>('');
  const { data, error } = useTrialMail(slug, status || undefined);
  return (
    <section aria-labelledby={`${id}-heading`}>
      <h2 id={`${id}-heading`} className="text-xl font-semibold text-leaf-900">
        Mail from this trial
      </h2>
      <p className="mt-1 text-sm text-loam-700">
        Invitations, follow confirmations and results notices. Mail waits in a queue and is retried
        for several hours when it cannot be delivered at once.
      </p>
      {data ? (
        <p className="mt-2 text-sm" aria-live="polite">
          {data.counts.pending} waiting · {data.counts.sent} sent · {data.counts.failed} not sent
        </p>
      ) : null}
      <div className="mt-2 flex items-center gap-2">
        <label htmlFor={`${id}-status`} className="font-medium">
          Show
        </label>
        <select
          id={`${id}-status`}
          value={status}
          onChange={(e) => setStatus(e.target.value as MailStatus | '')}
          className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
        >
          <option value="">All mail</option>
          {(['pending', 'sent', 'failed'] as const).map((s) => (
            <option key={s} value={s}>
              {statusWords[s]}
            </option>
          ))}
        </select>
      </div>
      {error ? <FormMessage tone="error">{error.message}</FormMessage> : null}
      {data && data.mail.length === 0 ? (
        <p className="mt-2 text-loam-700">No mail here yet.</p>
      ) : null}
      {data && data.mail.length > 0 ? (
        <ul className="mt-2 flex flex-col gap-2">
          {data.mail.map((m) => (
            <li key={m.id} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold break-all">{m.recipient}</p>
              <p className="text-sm">
                {mailKindLabels[m.kind]} · queued {when(m.createdAt)}
              </p>
              <p
                className={`text-sm ${m.status === 'failed' ? 'text-frost-600' : 'text-loam-700'}`}
              >
                {outcome(m)}
              </p>
              {m.status !== 'sent' && m.lastError ? (
                <p className="text-sm break-all text-loam-700">Last answer: {m.lastError}</p>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

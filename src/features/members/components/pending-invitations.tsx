import type { Invitation } from '@common/contracts/invitations';
import { roleLabels } from '@common/contracts/members';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/text-field';
import { useInvitations, useResendInvitation, useRevokeInvitation } from '../api/invitations';

const day = (iso: string) =>
  new Date(iso).toLocaleDateString(undefined, { day: 'numeric', month: 'short', year: 'numeric' });

function status(inv: Invitation) {
  if (inv.state === 'expired') return `Expired on ${day(inv.expiresAt)}`;
  if (inv.mailStatus === 'failed') return 'The mail could not be delivered; send it again';
  if (inv.mailStatus === 'pending') return 'Mail waiting to be sent';
  return `Sent${inv.lastSentAt ? ` ${day(inv.lastSentAt)}` : ''} · link valid until ${day(inv.expiresAt)}`;
}

export function PendingInvitations({
  slug,
  sites,
}: {
  slug: string;
  sites: { id: string; name: string }[];
}) {
  const { data, error } = useInvitations(slug);
  const resend = useResendInvitation(slug);
  const revoke = useRevokeInvitation(slug);
  if (error) return <FormMessage tone="error">{error.message}</FormMessage>;
  if (!data) return null;
  return (
    <section aria-labelledby="pending-heading">
      <h2 id="pending-heading" className="text-xl font-semibold text-leaf-900">
        Open invitations
      </h2>
      {data.invitations.length === 0 ? (
        <p className="mt-2 text-loam-700">No invitations are waiting.</p>
      ) : (
        <ul className="mt-2 flex flex-col gap-2">
          {data.invitations.map((inv) => (
            <li key={inv.id} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold break-all">{inv.email}</p>
              <p className="text-sm">
                {roleLabels[inv.role]}
                {inv.role === 'grower'
                  ? ` · ${
                      inv.siteIds
                        .map((s) => sites.find((x) => x.id === s)?.name)
                        .filter(Boolean)
                        .join(', ') || 'every site'
                    }`
                  : ''}
              </p>
              <p
                className={`text-sm ${inv.mailStatus === 'failed' || inv.state === 'expired' ? 'text-frost-600' : 'text-loam-700'}`}
              >
                {status(inv)}
              </p>
              <div className="mt-2 flex flex-wrap gap-2">
                <Button
                  variant="secondary"
                  disabled={resend.isPending}
                  onClick={() => resend.mutate(inv.id)}
                  aria-label={`Send again: the invitation to ${inv.email}`}
                >
                  Send again
                </Button>
                <Button
                  variant="ghost"
                  disabled={revoke.isPending}
                  onClick={() => revoke.mutate(inv.id)}
                  aria-label={`Withdraw the invitation to ${inv.email}`}
                >
                  Withdraw
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}
      {resend.error ? <FormMessage tone="error">{resend.error.message}</FormMessage> : null}
      {revoke.error ? <FormMessage tone="error">{revoke.error.message}</FormMessage> : null}
    </section>
  );
}

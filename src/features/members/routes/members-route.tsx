import { Link, useNavigate, useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { ApiError } from '@/lib/api-client';
import { useMembers } from '../api/get-members';
import { InviteForm } from '../components/invite-form';
import { MemberCard } from '../components/member-card';
import { PendingInvitations } from '../components/pending-invitations';
import { TrialMail } from '../components/trial-mail';

export function Component() {
  const { slug = '' } = useParams();
  const navigate = useNavigate();
  const { data, isPending, error } = useMembers(slug);
  if (isPending) return <Spinner label="Loading the members…" />;
  if (error) {
    if (error instanceof ApiError && error.status === 403) {
      return (
        <section className="py-6">
          <h1 className="text-2xl font-semibold text-leaf-900">Members</h1>
          <p className="mt-2">Only the trial’s leads manage its members and invitations.</p>
          <Link
            to={`/t/${slug}`}
            className="mt-4 inline-block font-semibold text-leaf-700 underline"
          >
            Back to the trial
          </Link>
        </section>
      );
    }
    return <ErrorPanel error={error} />;
  }
  return (
    <div className="flex flex-col gap-6">
      <header>
        <p className="text-sm uppercase tracking-wide text-loam-700">
          <Link to={`/t/${slug}`} className="underline">
            {data.trial.title}
          </Link>
        </p>
        <h1 className="mt-1 text-3xl font-semibold text-leaf-900">Members</h1>
        <p className="mt-1 text-loam-700">
          {data.members.length} {data.members.length === 1 ? 'person' : 'people'} · {data.leadCount}{' '}
          {data.leadCount === 1 ? 'lead' : 'leads'}. A trial always keeps at least one lead.
        </p>
      </header>
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <section aria-labelledby="members-heading">
          <h2 id="members-heading" className="sr-only">
            People in this trial
          </h2>
          <ul className="flex flex-col gap-2">
            {data.members.map((m) => (
              <MemberCard
                key={`${m.userId}-${m.role}-${m.siteIds.join()}`}
                slug={slug}
                member={m}
                sites={data.sites}
                onLeft={() => navigate('/')}
              />
            ))}
          </ul>
        </section>
        <div className="flex flex-col gap-6">
          <InviteForm slug={slug} sites={data.sites} />
          <PendingInvitations slug={slug} sites={data.sites} />
          <TrialMail slug={slug} />
        </div>
      </div>
    </div>
  );
}

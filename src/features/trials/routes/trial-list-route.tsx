import { designLabels } from '@common/contracts/trials';
import { Link } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useMe } from '@/lib/session';
import { useTrials } from '../api/get-trials';
import { trialHref } from '../components/trial-href';

export function Component() {
  const { data, isPending, error } = useTrials();
  const { data: me } = useMe();
  if (isPending) return <Spinner label="Loading trials…" />;
  if (error) return <ErrorPanel error={error} />;
  return (
    <section>
      <h1 className="text-3xl font-semibold text-leaf-900">Trials</h1>
      {me ? null : (
        <p className="mt-4 max-w-prose rounded-lg border border-leaf-100 bg-white p-4">
          <Link to="/sign-in" className="font-semibold text-leaf-700 underline">
            Sign in
          </Link>{' '}
          to see the trials you take part in.{' '}
          <Link to="/r" className="font-semibold text-leaf-700 underline">
            Published results sheets
          </Link>{' '}
          are open to everyone, searchable by crop and variety.
        </p>
      )}
      {data.trials.length === 0 ? (
        me ? (
          <p className="mt-4 max-w-prose rounded-lg border border-leaf-100 bg-white p-4">
            You are not part of any trial yet. A trial lead can invite you by e-mail.
          </p>
        ) : null
      ) : (
        <ul className="mt-4 grid gap-3 sm:grid-cols-2">
          {data.trials.map((t) => (
            <li key={t.id}>
              <Link
                to={trialHref(t, me?.isAdmin ?? false)}
                className="block rounded-xl border border-leaf-100 bg-white p-4 shadow-sm transition hover:border-leaf-500"
              >
                <p className="text-sm uppercase tracking-wide text-loam-700">
                  {t.crop} · {t.season}
                </p>
                <h2 className="mt-1 text-xl font-semibold text-leaf-900">{t.title}</h2>
                <p className="mt-2 text-sm">
                  {designLabels[t.design]} · {t.entryCount} entries · {t.siteCount}{' '}
                  {t.siteCount === 1 ? 'site' : 'sites'} · {t.plotCount} plots
                </p>
                <p className="mt-2 flex gap-2 text-xs">
                  <span className="rounded-full bg-straw-200 px-2 py-0.5 font-medium capitalize">
                    {t.status}
                  </span>
                  {t.myRole ? (
                    <span className="rounded-full bg-leaf-100 px-2 py-0.5 font-medium capitalize">
                      {t.myRole}
                    </span>
                  ) : null}
                </p>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

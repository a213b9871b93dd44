import { designLabels } from '@common/contracts/trials';
import { Link, useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useTrial } from '@/lib/trial';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { DataTable } from '@/components/ui/data-table';
import type { TrialWithPermissions } from '@/lib/trial';
import { createColumnHelper } from '@tanstack/react-table';

const entryCol = createColumnHelper<TrialWithPermissions['entries'][number]>();
const entryTypeLabel = {
  heirloom: 'Heirloom',
  open_pollinated: 'Open-pollinated',
  hybrid: 'Hybrid',
} as const;

export function Component() {
  const { slug = '' } = useParams();
  const { data: trial, isPending, error } = useTrial(slug);
  if (isPending) return <Spinner label="Loading the trial…" />;
  if (error) return <ErrorPanel error={error} />;
  return (
    <article>
      <p className="text-sm uppercase tracking-wide text-loam-700">
        {trial.crop} · {trial.season} · {designLabels[trial.design]}
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-leaf-900">{trial.title}</h1>
      {trial.copiedFrom ? (
        <p className="mt-1 text-sm text-loam-700">
          Copied from{' '}
          <Link
            className="font-medium text-leaf-700 underline"
            to={
              trial.copiedFrom.view === 'trial'
                ? `/t/${trial.copiedFrom.slug}`
                : `/r/${trial.copiedFrom.slug}`
            }
          >
            {trial.copiedFrom.title} ({trial.copiedFrom.season})
          </Link>
        </p>
      ) : null}
      <p className="mt-2 max-w-prose">{trial.description}</p>
      {trial.permissions['trial.edit'] ? (
        <nav aria-label="Design the trial" className="mt-3 flex flex-wrap gap-2">
          {(
            [
              ['settings', 'Settings'],
              ['entries', 'Entries'],
              ['sites', 'Sites'],
              ['traits', 'Traits'],
              ['layout', 'Layout'],
              ['map', 'Planting map'],
              ['field-sheet', 'Field sheet'],
              ['planting', 'What was planted'],
            ] as const
          ).map(([path, label]) => (
            <Link
              key={path}
              to={`/t/${trial.slug}/${path}`}
              className="inline-flex min-h-11 items-center rounded-lg border border-leaf-300 bg-white px-3 text-sm font-medium text-leaf-700 hover:bg-leaf-50"
            >
              {label}
            </Link>
          ))}
        </nav>
      ) : null}
      <p className="mt-3 flex flex-wrap gap-2">
        {trial.permissions['records.write'] || trial.permissions['notes.write'] ? (
          <Link
            to={`/t/${trial.slug}/log`}
            className="inline-flex min-h-11 items-center rounded-lg bg-pod-500 px-4 font-semibold text-ink hover:brightness-95"
          >
            Field log
          </Link>
        ) : null}
        <Link
          to={`/t/${trial.slug}/records/harvests`}
          className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900"
        >
          Records
        </Link>
        <Link
          to={`/t/${trial.slug}/photos`}
          className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900"
        >
          Photos
        </Link>
        <Link
          to={`/t/${trial.slug}/analysis`}
          className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900"
        >
          Analysis
        </Link>
        <Link
          to={`/t/${trial.slug}/compare`}
          className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900"
        >
          Compare entries
        </Link>
        {trial.permissions['trial.publish'] ? (
          <Link
            to={`/t/${trial.slug}/results`}
            className="inline-flex min-h-11 items-center rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700 hover:bg-leaf-50"
          >
            Results sheet
          </Link>
        ) : null}
        {trial.status === 'published' ? (
          <Link
            to={`/r/${trial.slug}`}
            className="inline-flex min-h-11 items-center px-2 font-semibold text-leaf-700 underline"
          >
            Published results
          </Link>
        ) : null}
      </p>
      <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-5">
        {[
          ['Entries', trial.entryCount],
          ['Sites', trial.siteCount],
          ['Plots', trial.plotCount],
          ['Harvests logged', trial.harvestCount],
          ['Measurements', trial.observationCount],
        ].map(([label, value]) => (
          <div key={label} className="rounded-lg bg-white p-3 shadow-sm">
            <dt className="text-xs uppercase tracking-wide text-loam-700">{label}</dt>
            <dd className="font-display text-2xl font-semibold text-leaf-900">{value}</dd>
          </div>
        ))}
      </dl>

      <section className="mt-6" aria-labelledby="entries-heading">
        <h2 id="entries-heading" className="text-xl font-semibold text-leaf-900">
          Entries
        </h2>
        <ScrollRegion label="Entries" className="mt-2 rounded-lg bg-white shadow-sm">
          <DataTable
            className="min-w-[32rem]"
            caption={`Entries in ${trial.title}`}
            data={trial.entries}
            rowId={(e) => e.id}
            rowHeader="code"
            columns={[
              entryCol.accessor('code', {
                header: 'Code',
                meta: { cellClassName: () => 'font-mono' },
              }),
              entryCol.accessor('name', {
                header: 'Variety',
                cell: ({ row: { original: e } }) =>
                  e.varietySlug ? (
                    <Link
                      to={`/varieties/${e.varietySlug}`}
                      className="text-leaf-800 underline decoration-leaf-300 underline-offset-2 hover:decoration-leaf-700"
                    >
                      {e.name}
                    </Link>
                  ) : (
                    e.name
                  ),
              }),
              entryCol.accessor((e) => entryTypeLabel[e.entryType], { id: 'type', header: 'Type' }),
              entryCol.accessor('seedSource', { header: 'Seed source' }),
              entryCol.accessor((e) => e.daysToMaturityClaimed ?? undefined, {
                id: 'claimedDays',
                header: 'Claimed days to maturity (d)',
                cell: (c) => c.getValue() ?? '—',
                sortUndefined: 'last',
                meta: { align: 'right' },
              }),
            ]}
          />
        </ScrollRegion>
      </section>

      <section className="mt-6" aria-labelledby="sites-heading">
        <h2 id="sites-heading" className="text-xl font-semibold text-leaf-900">
          Sites
        </h2>
        <ul className="mt-2 grid gap-3 sm:grid-cols-3">
          {trial.sites.map((s) => (
            <li key={s.id} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold">{s.name}</p>
              <p className="text-sm text-loam-700">{s.region}</p>
              <p className="mt-1 text-sm">
                {s.soilTexture ?? 'Soil not recorded'} ·{' '}
                {s.irrigationMethod ?? 'irrigation not recorded'}
              </p>
            </li>
          ))}
        </ul>
      </section>

      <section className="mt-6" aria-labelledby="traits-heading">
        <h2 id="traits-heading" className="text-xl font-semibold text-leaf-900">
          Traits recorded
        </h2>
        <ul className="mt-2 flex flex-wrap gap-2">
          {trial.traits.map((t) => (
            <li key={t.id} className="rounded-full bg-straw-200 px-3 py-1 text-sm">
              {t.label}
              <span className="text-loam-700">
                {' '}
                ·{' '}
                {t.direction === 'higher'
                  ? 'higher is better'
                  : t.direction === 'lower'
                    ? 'lower is better'
                    : 'no preference'}
              </span>
            </li>
          ))}
        </ul>
      </section>
    </article>
  );
}

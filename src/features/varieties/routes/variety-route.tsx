/**
 * A variety's page: what it is, every trial, planting and site it was grown in with its mean,
 * rank and letter group for each trait, season by season (a table and a chart), its photos and
 * notes. Members see live figures; anyone else what published versions show.
 */
import { displayUnit, formatInUnit, type DisplayUnit, typicalOf } from '@common/display-units';
import {
  type VarietyRecord,
  type VarietyTrait,
  type VarietyTrial,
  varietyTypeLabels,
} from '@common/contracts/varieties';
import { createColumnHelper } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { useMe, useUnitSystem } from '@/lib/session';
import { useGroups } from '@/lib/groups';
import { useVariety } from '../api/get-variety';
import { seasonSiteTable } from '../components/season-chart-data';
import { SeasonChart } from '../components/season-chart';
import { CoverPicker } from '../components/cover-picker';
import { VarietyForm } from '../components/variety-form';

const trialHref = (t: VarietyTrial) =>
  t.view === 'trial' ? `/t/${t.slug}` : `/r/${t.slug}/v/${t.version}`;

interface FigureRow {
  id: string;
  trial: VarietyTrial;
  trait: VarietyTrait;
  unit: DisplayUnit;
}
const column = createColumnHelper<FigureRow>();

/** One display unit per trait across the whole record, chosen by its typical mean. */
function unitsByTrait(trials: readonly VarietyTrial[], system: 'metric' | 'us') {
  const means = new Map<string, { unit: string; values: number[] }>();
  for (const t of trials)
    for (const x of t.traits) {
      const m = means.get(x.key) ?? { unit: x.unit, values: [] };
      if (x.mean !== null) m.values.push(x.mean);
      means.set(x.key, m);
    }
  return new Map(
    [...means].map(([key, m]) => [key, displayUnit(m.unit, system, typicalOf(m.values))]),
  );
}

const figureColumns = [
  column.accessor((r) => r.trial.season, { id: 'season', header: 'Season' }),
  column.accessor((r) => r.trial.title, {
    id: 'trial',
    header: 'Trial',
    cell: (c) => (
      <Link to={trialHref(c.row.original.trial)} className="text-leaf-800 underline">
        {c.getValue()}
      </Link>
    ),
  }),
  column.accessor((r) => r.trait.label, { id: 'trait', header: 'Trait' }),
  // null → undefined: react-table puts only undefined last whichever way a column sorts.
  column.accessor((r) => r.trait.mean ?? undefined, {
    id: 'mean',
    header: 'Mean',
    sortUndefined: 'last',
    cell: (c) => formatInUnit(c.getValue(), c.row.original.unit, c.row.original.trait.decimals),
  }),
  column.accessor((r) => r.trait.rank ?? undefined, {
    id: 'rank',
    header: 'Rank',
    // Rank 1 is the best: the first press puts it on top.
    sortDescFirst: false,
    sortUndefined: 'last',
    cell: (c) =>
      c.getValue() === undefined
        ? 'not ranked'
        : `${c.getValue()} of ${c.row.original.trait.entryCount}`,
  }),
  column.accessor((r) => r.trait.group, {
    id: 'group',
    header: 'Letter group',
    cell: (c) => <span className="font-mono">{c.getValue() || '—'}</span>,
  }),
  column.accessor((r) => r.trait.sites.map((s) => s.site).join(', '), {
    id: 'sites',
    header: 'At each site',
    enableSorting: false,
    cell: (c) => (
      <ul>
        {c.row.original.trait.sites.map((s) => (
          <li key={s.site}>
            {s.site}: {formatInUnit(s.mean, c.row.original.unit, c.row.original.trait.decimals)}
          </li>
        ))}
      </ul>
    ),
  }),
];

function About({ record, onEdit }: { record: VarietyRecord; onEdit?: () => void }) {
  const v = record.variety;
  const { data: me } = useMe();
  // The group's people keep and share its seed; the seed page is theirs.
  const { data: groups } = useGroups(Boolean(me));
  const inGroup = groups?.groups.some((g) => g.id === v.group.id) ?? false;
  // The cover is one of the photos this page shows, each with the caption its uploader wrote.
  const coverCaption = record.photos.find((p) => p.id === v.cover?.id)?.caption;
  return (
    <>
      {v.cover ? (
        <img
          src={v.cover.displayUrl}
          alt={coverCaption || `${v.name}, cover photo`}
          className="mb-3 max-h-80 w-full rounded-lg object-cover"
        />
      ) : null}
      <p className="text-sm uppercase tracking-wide text-loam-700">
        {v.crop} · {varietyTypeLabels[v.type]} · {v.group.name}
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-leaf-900">{v.name}</h1>
      {v.aliases.length ? (
        <p className="text-sm text-loam-700">Also known as {v.aliases.join(', ')}</p>
      ) : null}
      {v.description ? <p className="mt-2 max-w-prose">{v.description}</p> : null}
      <dl className="mt-2 grid max-w-prose gap-x-4 gap-y-1 text-sm sm:grid-cols-[auto_1fr]">
        {v.origin ? (
          <>
            <dt className="font-semibold">Origin</dt>
            <dd>{v.origin}</dd>
          </>
        ) : null}
        {v.seedSource ? (
          <>
            <dt className="font-semibold">Seed source</dt>
            <dd>{v.seedSource}</dd>
          </>
        ) : null}
        {v.expectedTraits.length ? (
          <>
            <dt className="font-semibold">Expected traits</dt>
            <dd>{v.expectedTraits.join(', ')}</dd>
          </>
        ) : null}
      </dl>
      <p className="mt-3 flex flex-wrap gap-2">
        <Link
          to={`/varieties/compare?varieties=${v.slug}`}
          className="inline-flex min-h-11 items-center rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700 hover:bg-leaf-50"
        >
          Compare with other varieties
        </Link>
        {inGroup ? (
          <Link
            to={`/varieties/${v.slug}/seed`}
            className="inline-flex min-h-11 items-center rounded-lg border border-leaf-700 bg-white px-4 font-semibold text-leaf-700 hover:bg-leaf-50"
          >
            Seed lots and offers
          </Link>
        ) : null}
        {onEdit ? (
          <button
            type="button"
            onClick={onEdit}
            className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900"
          >
            Edit variety
          </button>
        ) : null}
      </p>
    </>
  );
}

function Record({ record }: { record: VarietyRecord }) {
  const system = useUnitSystem();
  const units = useMemo(() => unitsByTrait(record.trials, system), [record.trials, system]);
  const traits = useMemo(() => {
    const seen = new Map<string, string>();
    for (const t of record.trials)
      for (const x of t.traits) if (!seen.has(x.key)) seen.set(x.key, x.label);
    return [...seen];
  }, [record.trials]);
  const [chosen, setChosen] = useState<string | null>(null);
  const chartKey = chosen ?? traits[0]?.[0] ?? '';
  const chartUnit = units.get(chartKey) ?? { label: '', factor: 1 };
  const table = useMemo(
    () => seasonSiteTable(record.trials, chartKey, chartUnit.factor),
    [record.trials, chartKey, chartUnit.factor],
  );
  const rows: FigureRow[] = record.trials.flatMap((trial) =>
    trial.traits.map((trait) => ({
      id: `${trial.slug}/${trait.key}`,
      trial,
      trait,
      unit: units.get(trait.key)!,
    })),
  );
  const seasons = new Set(record.trials.map((t) => t.season)).size;
  const label = traits.find(([k]) => k === chartKey)?.[1] ?? '';

  if (record.trials.length === 0)
    return (
      <p className="mt-4 max-w-prose rounded-lg border border-leaf-100 bg-white p-4">
        No trial you may see has grown this variety yet.
      </p>
    );
  return (
    <>
      <section className="mt-6" aria-labelledby="grown-heading">
        <h2 id="grown-heading" className="text-xl font-semibold text-leaf-900">
          Grown in {record.trials.length} {record.trials.length === 1 ? 'trial' : 'trials'} over{' '}
          {seasons} {seasons === 1 ? 'season' : 'seasons'}
        </h2>
        <ul className="mt-2 grid gap-3 sm:grid-cols-2">
          {record.trials.map((t) => (
            <li key={t.slug} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="text-sm uppercase tracking-wide text-loam-700">
                {t.season}
                {t.view === 'sheet' ? ` · published version ${t.version}` : ''}
              </p>
              <p className="font-semibold">
                <Link to={trialHref(t)} className="text-leaf-800 underline">
                  {t.title}
                </Link>
              </p>
              <p className="text-sm">
                Entry <span className="font-mono">{t.entry.code}</span> as {t.entry.name} ·{' '}
                {t.sites.map((s) => s.name).join(', ')}
              </p>
              {t.entry.notes ? <p className="mt-1 text-sm">Notes: {t.entry.notes}</p> : null}
              {t.warnings.map((w) => (
                <p key={w} className="mt-1 text-sm text-loam-700">
                  {w}
                </p>
              ))}
            </li>
          ))}
        </ul>
      </section>

      {traits.length ? (
        <section className="mt-6" aria-labelledby="chart-heading">
          <div className="flex flex-wrap items-end gap-3">
            <h2 id="chart-heading" className="text-xl font-semibold text-leaf-900">
              {label} over the seasons
            </h2>
            <label className="text-sm">
              Trait{' '}
              <select
                className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
                value={chartKey}
                onChange={(e) => setChosen(e.target.value)}
              >
                {traits.map(([key, text]) => (
                  <option key={key} value={key}>
                    {text}
                  </option>
                ))}
              </select>
            </label>
          </div>
          <figure className="mt-2 h-72 rounded-lg bg-white p-2 shadow-sm">
            <SeasonChart table={table} unit={chartUnit} />
            <figcaption className="sr-only">
              {label} of {record.variety.name}
              {chartUnit.label ? ` in ${chartUnit.label}` : ''}, one line per site, one point per
              trial, oldest season first. The table below gives the same figures.
            </figcaption>
          </figure>
        </section>
      ) : null}

      <section className="mt-6" aria-labelledby="figures-heading">
        <h2 id="figures-heading" className="text-xl font-semibold text-leaf-900">
          Season by season
        </h2>
        <p className="text-sm text-loam-700">
          Mean over the trial (least-squares where its layout was unbalanced), rank among the
          trial’s entries in the trait’s direction (1 = best; traits with no preferred direction are
          not ranked), and letter group (entries sharing a letter did not differ significantly).
        </p>
        {/* A phone reads one card per trial (a wide table's trial names wrapped to many lines);
            a wider screen the table. Only the one shown is in the accessibility tree. */}
        <section aria-label="Figures season by season" className="mt-2 sm:hidden">
          <ul className="space-y-3">
            {record.trials.map((t) => (
              <li key={t.slug} className="rounded-lg bg-white p-3 shadow-sm">
                <p className="text-sm uppercase tracking-wide text-loam-700">{t.season}</p>
                <p className="font-semibold">
                  <Link to={trialHref(t)} className="text-leaf-800 underline">
                    {t.title}
                  </Link>
                </p>
                <ul className="mt-2 divide-y divide-straw-200">
                  {t.traits.map((x) => {
                    const unit = units.get(x.key)!;
                    return (
                      <li key={x.key} className="py-2">
                        <p className="font-medium">{x.label}</p>
                        <p className="tabular-nums">
                          {formatInUnit(x.mean, unit, x.decimals)}
                          {' · '}
                          {x.rank === null ? 'not ranked' : `rank ${x.rank} of ${x.entryCount}`}
                          {x.group ? (
                            <>
                              {' · group '}
                              <span className="font-mono">{x.group}</span>
                            </>
                          ) : null}
                        </p>
                        {x.sites.length > 1 ? (
                          <p className="text-sm text-loam-700">
                            {x.sites
                              .map(
                                (site) =>
                                  `${site.site}: ${formatInUnit(site.mean, unit, x.decimals)}`,
                              )
                              .join(' · ')}
                          </p>
                        ) : null}
                      </li>
                    );
                  })}
                </ul>
              </li>
            ))}
          </ul>
        </section>
        <ScrollRegion
          label="Figures season by season"
          hint="The table scrolls sideways."
          className="mt-2 hidden rounded-lg bg-white shadow-sm sm:block"
        >
          <div className="min-w-[44rem]">
            <DataTable
              caption={`${record.variety.name}: figures season by season`}
              data={rows}
              columns={figureColumns}
              rowId={(r) => r.id}
            />
          </div>
        </ScrollRegion>
      </section>

      {record.photos.length ? (
        <section className="mt-6" aria-labelledby="photos-heading">
          <h2 id="photos-heading" className="text-xl font-semibold text-leaf-900">
            Photos
          </h2>
          <ul className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-4">
            {record.photos.map((p) => (
              <li key={p.id} className="rounded-lg bg-white p-2 shadow-sm">
                <a href={p.displayUrl}>
                  <img
                    src={p.thumbUrl}
                    alt={p.caption || `${record.variety.name}, ${p.season}`}
                    className="aspect-square w-full rounded object-cover"
                    loading="lazy"
                  />
                </a>
                <p className="mt-1 text-xs text-loam-700">
                  {p.season}
                  {p.caption ? ` · ${p.caption}` : ''}
                </p>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </>
  );
}

export function Component() {
  const { variety = '' } = useParams();
  const { data, isPending, error } = useVariety(variety);
  const [editing, setEditing] = useState(false);
  if (isPending) return <Spinner label="Loading the variety…" />;
  if (error) return <ErrorPanel error={error} />;
  return (
    <article>
      <p className="text-sm text-loam-700">
        <Link to="/varieties" className="underline">
          Variety register
        </Link>
      </p>
      {editing ? (
        <>
          <h1 className="mt-1 text-3xl font-semibold text-leaf-900">{data.variety.name}</h1>
          <div className="mt-3">
            <VarietyForm
              groups={[data.variety.group]}
              editing={data.variety}
              onSaved={() => setEditing(false)}
              onCancel={() => setEditing(false)}
            />
          </div>
        </>
      ) : (
        <About record={data} onEdit={data.canEdit ? () => setEditing(true) : undefined} />
      )}
      {data.canEdit && data.photos.length ? (
        <CoverPicker key={data.variety.cover?.id ?? ''} record={data} />
      ) : null}
      <Record record={data} />
    </article>
  );
}

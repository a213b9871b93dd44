/**
 * Varieties side by side across trials and seasons: entry means on one trait per trial and site,
 * the trials each pair shared (pairs that shared none are marked, never compared), and the
 * stability of the crop's varieties across environments. The choice lives in the address.
 */
import type { Comparison } from '@common/contracts/varieties';
import { displayUnit, formatInUnit, typicalOf } from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';
import { useEffect, useMemo, useRef, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { useMe, useUnitSystem } from '@/lib/session';
import { useVarietyComparison } from '../api/compare-varieties';
import { useGroups } from '@/lib/groups';
import { useVarieties } from '../api/get-varieties';
import { StabilitySection } from '../components/stability-section';

type MeansRow = Comparison['rows'][number] & { name: string };
const column = createColumnHelper<MeansRow>();

function VarietyChooser({
  chosen,
  onChange,
}: {
  chosen: string[];
  onChange: (slugs: string[]) => void;
}) {
  const varieties = useVarieties();
  // The boxes answer at once and quick clicks build on each other; the address follows (its
  // update may land a render later).
  const [picked, setPicked] = useState(chosen);
  const latest = useRef(chosen);
  const chosenKey = chosen.join(',');
  useEffect(() => {
    latest.current = chosenKey ? chosenKey.split(',') : [];
    setPicked(latest.current);
  }, [chosenKey]);
  const toggle = (slug: string, on: boolean) => {
    const rest = latest.current.filter((s) => s !== slug);
    const next = on ? [...rest, slug] : rest;
    latest.current = next;
    setPicked(next);
    onChange(next);
  };
  if (varieties.isPending) return <Spinner label="Loading the register…" />;
  if (varieties.error) return <ErrorPanel error={varieties.error} />;
  const crops = [...new Set(varieties.data.varieties.map((v) => v.crop))];
  return (
    <fieldset className="mt-3 rounded-lg bg-white p-3 shadow-sm">
      <legend className="px-1 text-sm font-semibold">Varieties to compare (two or more)</legend>
      {crops.map((crop) => (
        <div key={crop} className="mt-1">
          <p className="text-xs uppercase tracking-wide text-loam-700">{crop}</p>
          <div className="flex flex-wrap gap-x-4">
            {varieties.data.varieties
              .filter((v) => v.crop === crop)
              .map((v) => (
                <label key={v.slug} className="flex min-h-11 items-center gap-2 text-sm">
                  <input
                    type="checkbox"
                    className="h-5 w-5"
                    checked={picked.includes(v.slug)}
                    onChange={(e) => toggle(v.slug, e.target.checked)}
                  />
                  {v.name}
                  <span className="text-loam-700">
                    ({v.seasonCount} {v.seasonCount === 1 ? 'season' : 'seasons'})
                  </span>
                </label>
              ))}
          </div>
        </div>
      ))}
    </fieldset>
  );
}

function ComparisonTables({ data }: { data: Comparison }) {
  const system = useUnitSystem();
  const unit = displayUnit(
    data.trait?.unit ?? '',
    system,
    typicalOf(data.rows.flatMap((r) => r.means.filter((m): m is number => m !== null))),
  );
  const decimals = data.trait?.decimals ?? 1;
  const names = new Map(data.varieties.map((v) => [v.slug, v.name]));
  const rows: MeansRow[] = data.rows.map((r) => ({ ...r, name: names.get(r.slug) ?? r.slug }));
  const columns = useMemo(
    () => [
      column.accessor('name', {
        header: 'Variety',
        cell: (c) => (
          <Link to={`/varieties/${c.row.original.slug}`} className="text-leaf-800 underline">
            {c.getValue()}
          </Link>
        ),
      }),
      ...data.columns.map((col, i) =>
        column.accessor((r) => r.means[i] ?? undefined, {
          id: `e${i}`,
          header: `${col.season} · ${col.trialTitle} · ${col.site}`,
          sortUndefined: 'last',
          cell: (c) =>
            c.getValue() === undefined ? (
              <span className="text-loam-700">not grown</span>
            ) : (
              formatInUnit(c.getValue(), unit, decimals)
            ),
        }),
      ),
    ],
    [data.columns, unit, decimals],
  );
  return (
    <>
      <section className="mt-6" aria-labelledby="means-heading">
        <h2 id="means-heading" className="text-xl font-semibold text-leaf-900">
          {data.trait ? data.trait.label : 'No trait measured'}
          {unit.label ? ` (${unit.label})` : ''} by trial and site
        </h2>
        <p className="text-sm text-loam-700">
          Each cell is the variety’s mean of its plot values at one site of one trial. Means from
          different trials are not adjusted for the season or site: read them side by side only
          where the varieties shared a trial (below).
        </p>
        {data.columns.length === 0 ? (
          <p className="mt-2 rounded-lg border border-leaf-100 bg-white p-3">
            None of these varieties has figures on this trait that you may see.
          </p>
        ) : (
          <ScrollRegion
            label="Means by trial and site"
            hint="The table scrolls sideways."
            className="mt-2 rounded-lg bg-white shadow-sm"
          >
            <div className="min-w-[36rem]">
              <DataTable
                caption="Means by trial and site"
                data={rows}
                columns={columns}
                rowId={(r) => r.slug}
                rowHeader="name"
              />
            </div>
          </ScrollRegion>
        )}
      </section>
      <section className="mt-6" aria-labelledby="pairs-heading">
        <h2 id="pairs-heading" className="text-xl font-semibold text-leaf-900">
          Pairs
        </h2>
        <ul className="mt-2 space-y-2">
          {data.pairs.map((p) => (
            <li key={`${p.a}/${p.b}`} className="rounded-lg bg-white p-3 shadow-sm">
              <p className="font-semibold">
                {names.get(p.a)} and {names.get(p.b)}
              </p>
              {p.sharedTrials === 0 ? (
                <p className="text-sm">
                  <strong>Never grown in the same trial</strong> — not compared: their means come
                  from different seasons or sites.
                </p>
              ) : (
                <p className="text-sm">
                  Shared {p.sharedTrials} {p.sharedTrials === 1 ? 'trial' : 'trials'} (
                  {p.sharedEnvironments}{' '}
                  {p.sharedEnvironments === 1 ? 'environment' : 'environments'})
                  {p.difference === null
                    ? ''
                    : `; mean difference ${names.get(p.a)} − ${names.get(p.b)}: ${formatInUnit(p.difference, unit, decimals)}`}
                </p>
              )}
            </li>
          ))}
        </ul>
      </section>
    </>
  );
}

export function Component() {
  const [params, setParams] = useSearchParams();
  const { data: me } = useMe();
  const chosen = (params.get('varieties') ?? '').split(',').filter(Boolean);
  const trait = params.get('trait') ?? undefined;
  const comparison = useVarietyComparison(chosen, trait);
  const groups = useGroups(Boolean(me));
  const register = useVarieties(Boolean(me));
  const update = (next: { varieties?: string[]; trait?: string }) => {
    const q = new URLSearchParams();
    const v = next.varieties ?? chosen;
    if (v.length) q.set('varieties', v.join(','));
    const t = 'trait' in next ? next.trait : trait;
    if (t) q.set('trait', t);
    setParams(q, { replace: true });
  };
  // Stability starts on the first chosen variety's crop, in its register.
  const first =
    register.data?.varieties.find((v) => v.slug === chosen[0]) ?? register.data?.varieties[0];

  return (
    <div>
      <p className="text-sm text-loam-700">
        <Link to="/varieties" className="underline">
          Variety register
        </Link>
      </p>
      <h1 className="text-3xl font-semibold text-leaf-900">Compare varieties across seasons</h1>
      {me ? (
        <VarietyChooser chosen={chosen} onChange={(v) => update({ varieties: v })} />
      ) : (
        <p className="mt-2 max-w-prose text-sm">
          Signed out, the comparison shows what published results sheets show.{' '}
          <Link to="/sign-in" className="font-semibold text-leaf-700 underline">
            Sign in
          </Link>{' '}
          to choose from your groups’ registers.
        </p>
      )}
      {chosen.length < 2 ? (
        <p className="mt-3 rounded-lg border border-leaf-100 bg-white p-3">
          Choose at least two varieties.
        </p>
      ) : comparison.isPending ? (
        <Spinner label="Comparing…" />
      ) : comparison.error ? (
        <ErrorPanel error={comparison.error} />
      ) : (
        <div aria-busy={comparison.isFetching}>
          <label className="mt-3 block text-sm">
            Trait{' '}
            <select
              className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
              value={comparison.data.trait?.key ?? ''}
              onChange={(e) => update({ trait: e.target.value })}
            >
              {comparison.data.traits.map((t) => (
                <option key={t.key} value={t.key}>
                  {t.label}
                </option>
              ))}
            </select>
          </label>
          <ComparisonTables data={comparison.data} />
        </div>
      )}
      {me && groups.data && groups.data.groups.length > 0 && first ? (
        <StabilitySection
          key={`${first.groupId}/${first.crop}`}
          groups={groups.data.groups}
          initialGroup={first.groupId}
          initialCrop={first.crop}
        />
      ) : null}
    </div>
  );
}

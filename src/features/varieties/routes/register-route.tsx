/** The variety register: every variety of the caller's groups, searchable; coordinators add. */
import { type VarietySummary, varietyTypeLabels } from '@common/contracts/varieties';
import { createColumnHelper } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { DataTable } from '@/components/ui/data-table';
import { ErrorPanel } from '@/components/ui/error-panel';
import { ScrollRegion } from '@/components/ui/scroll-region';
import { Spinner } from '@/components/ui/spinner';
import { useGroups } from '@/lib/groups';
import { useVarieties } from '../api/get-varieties';
import { VarietyForm } from '../components/variety-form';

const column = createColumnHelper<VarietySummary>();
const columns = [
  column.accessor('name', {
    header: 'Variety',
    cell: (c) => (
      <span className="flex items-center gap-2">
        {c.row.original.cover ? (
          <img
            src={c.row.original.cover.thumbUrl}
            // Beside the variety's name: read out, the name would be heard twice.
            alt=""
            className="size-10 shrink-0 rounded object-cover"
            loading="lazy"
          />
        ) : null}
        <Link
          to={`/varieties/${c.row.original.slug}`}
          className="font-semibold text-leaf-800 underline decoration-leaf-300 underline-offset-2 hover:decoration-leaf-700"
        >
          {c.getValue()}
        </Link>
      </span>
    ),
  }),
  column.accessor('crop', { header: 'Crop' }),
  column.accessor((v) => varietyTypeLabels[v.type], { id: 'type', header: 'Type' }),
  column.accessor('trialCount', { header: 'Trials' }),
  column.accessor('seasonCount', { header: 'Seasons' }),
  column.accessor((v) => v.aliases.join(', '), { id: 'aliases', header: 'Other names' }),
];

/** Lower case with accents and punctuation folded, so "okra" finds "Okra" and "Copperbell" "copper-bell". */
const folded = (s: string) =>
  s
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, ' ')
    .trim();

export function Component() {
  const varieties = useVarieties();
  const groups = useGroups();
  const navigate = useNavigate();
  const [search, setSearch] = useState('');
  const [adding, setAdding] = useState(false);
  const shown = useMemo(() => {
    const words = folded(search).split(' ').filter(Boolean);
    return (varieties.data?.varieties ?? []).filter((v) => {
      const text = folded([v.name, v.crop, ...v.aliases].join(' '));
      return words.every((w) => text.includes(w));
    });
  }, [varieties.data, search]);
  const coordinated = (groups.data?.groups ?? []).filter((g) => g.myRole === 'coordinator');

  if (varieties.isPending) return <Spinner label="Loading the register…" />;
  if (varieties.error) return <ErrorPanel error={varieties.error} />;
  const all = varieties.data.varieties;
  return (
    <section>
      <h1 className="text-3xl font-semibold text-leaf-900">Variety register</h1>
      <p className="mt-1 max-w-prose text-loam-700">
        Every variety your groups have grown or keep, followed from trial to trial and season to
        season.{' '}
        <Link to="/varieties/compare" className="font-semibold text-leaf-700 underline">
          Compare varieties across seasons
        </Link>
      </p>
      {coordinated.length > 0 ? (
        <div className="mt-3">
          {adding ? (
            <VarietyForm
              groups={coordinated}
              editing={null}
              onSaved={(slug) => navigate(`/varieties/${slug}`)}
              onCancel={() => setAdding(false)}
            />
          ) : (
            <button
              type="button"
              onClick={() => setAdding(true)}
              className="inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900"
            >
              Add a variety
            </button>
          )}
        </div>
      ) : null}
      {all.length === 0 ? (
        <p className="mt-4 max-w-prose rounded-lg border border-leaf-100 bg-white p-4">
          Your groups’ registers have no varieties yet. A trial’s entries join its group’s register
          when they are added.
        </p>
      ) : (
        <>
          <label className="mt-4 block max-w-md text-sm font-medium">
            Search the register
            <input
              type="search"
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              placeholder="Name, crop or other name"
              className="mt-1 block min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3"
            />
          </label>
          <p className="mt-2 text-sm text-loam-700" role="status">
            {shown.length === all.length
              ? `${all.length} varieties`
              : `${shown.length} of ${all.length} varieties`}
          </p>
          <ScrollRegion
            label="Register varieties"
            hint="The table scrolls sideways."
            className="mt-2 rounded-lg bg-white shadow-sm"
          >
            <div className="min-w-[36rem]">
              <DataTable
                caption="Register varieties"
                data={shown}
                columns={columns}
                rowId={(v) => v.id}
                rowHeader="name"
              />
            </div>
          </ScrollRegion>
        </>
      )}
    </section>
  );
}

import type { ConflictDetails, Observation } from '@common/contracts/records';
import { formatLength, formatMass, fromStored, type QuantityUnit, toStored } from '@common/units';
import {
  type ColumnDef,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  type SortingState,
  useReactTable,
} from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useUnitSystem } from '@/lib/session';
import { useTrial } from '@/lib/trial';
import {
  conflictOf,
  useDeleteRecord,
  useObservations,
  useUndoDelete,
  useUpdateObservation,
} from '../api/record-api';
import { ConflictNotice } from '../components/conflict-notice';
import { RecordsNav } from '../components/records-nav';
import { UndoToast } from '../components/undo-toast';

const cell = 'min-h-11 w-full rounded border border-leaf-300 bg-white px-2';

/** The observation log: measurements, scores and dates, one row per plant or plot. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const units = useUnitSystem();
  const [siteId, setSiteId] = useState('');
  const [traitId, setTraitId] = useState('');
  const [search, setSearch] = useState('');
  const [sorting, setSorting] = useState<SortingState>([{ id: 'observedOn', desc: true }]);
  const [draft, setDraft] = useState<{
    id: string;
    version: number;
    value: string;
    note: string;
  } | null>(null);
  const [conflict, setConflict] = useState<ConflictDetails | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [deleted, setDeleted] = useState<Observation | null>(null);
  const observations = useObservations(slug, { siteId: siteId || undefined });
  const update = useUpdateObservation(slug);
  const remove = useDeleteRecord(slug, 'observations');
  const undo = useUndoDelete(slug, 'observations');
  const kindOf = useMemo(
    () => new Map((trial.data?.traits ?? []).map((t) => [t.id, t.quantityKind])),
    [trial.data],
  );
  const editUnit = (traitOf: string): QuantityUnit | null => {
    const k = kindOf.get(traitOf);
    if (k === 'length') return units === 'metric' ? 'mm' : 'in';
    if (k === 'mass') return units === 'metric' ? 'g' : 'oz';
    return null;
  };
  const show = (o: Observation) => {
    if (o.valueDate) return o.valueDate;
    const k = kindOf.get(o.traitId);
    if (o.value === null) return '—';
    if (k === 'length') return formatLength(o.value, units, 0);
    if (k === 'mass') return formatMass(o.value, units);
    if (k === 'percent') return `${o.value} %`;
    return String(o.value);
  };

  const columns = useMemo<ColumnDef<Observation>[]>(
    () => [
      { accessorKey: 'observedOn', header: 'Date' },
      { accessorKey: 'siteName', header: 'Site' },
      { accessorKey: 'plotNumber', header: 'Plot' },
      { id: 'entry', accessorFn: (o) => `${o.entryName} (${o.entryCode})`, header: 'Entry' },
      { accessorKey: 'traitLabel', header: 'Trait' },
      { accessorKey: 'plantNumber', header: 'Plant' },
      {
        id: 'value',
        accessorFn: (o) => o.value ?? o.valueDate,
        header: 'Value',
        cell: (c) => show(c.row.original),
      },
      { accessorKey: 'note', header: 'Note', enableSorting: false },
      { accessorKey: 'updatedByName', header: 'By' },
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [units, kindOf],
  );
  const data = useMemo(() => {
    const q = search.trim().toLowerCase();
    return (observations.data?.observations ?? []).filter(
      (o) =>
        (!traitId || o.traitId === traitId) &&
        (!q ||
          [o.entryName, o.entryCode, o.note, o.siteName, o.traitLabel, String(o.plotNumber)]
            .join(' ')
            .toLowerCase()
            .includes(q)),
    );
  }, [observations.data, traitId, search]);
  const table = useReactTable({
    data,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });

  if (trial.isPending) return <Spinner />;
  if (trial.error) return <ErrorPanel error={trial.error} />;
  const canWrite = trial.data.permissions['records.write'];
  const rows = table.getRowModel().rows;

  const save = async (o: Observation) => {
    if (!draft) return;
    const unit = editUnit(o.traitId);
    const typed = Number(draft.value.replace(',', '.'));
    try {
      await update.mutateAsync({
        id: o.id,
        body: o.valueDate
          ? { version: draft.version, valueDate: draft.value, note: draft.note }
          : {
              version: draft.version,
              value: unit ? toStored(typed, unit) : typed,
              note: draft.note,
            },
      });
      setDraft(null);
      setConflict(null);
      setProblem(null);
    } catch (err) {
      const c = conflictOf(err);
      if (c) setConflict(c);
      else setProblem(err instanceof Error ? err.message : 'Not saved.');
    }
  };

  return (
    <article className="space-y-3">
      <h1 className="text-2xl font-semibold text-leaf-900">Observation log · {trial.data.title}</h1>
      <RecordsNav slug={slug} />
      <div className="flex flex-wrap items-end gap-2 rounded-lg bg-white p-3 shadow-sm">
        <label className="flex flex-col gap-1 text-sm font-medium">
          Site
          <select
            value={siteId}
            onChange={(e) => setSiteId(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            <option value="">All sites</option>
            {trial.data.sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          Trait
          <select
            value={traitId}
            onChange={(e) => setTraitId(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          >
            <option value="">All traits</option>
            {trial.data.traits.map((t) => (
              <option key={t.id} value={t.id}>
                {t.label}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col gap-1 text-sm font-medium">
          Search
          <input
            value={search}
            onChange={(e) => setSearch(e.target.value)}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          />
        </label>
      </div>
      {conflict && draft ? (
        <ConflictNotice
          conflict={conflict}
          onCancel={() => {
            setDraft(null);
            setConflict(null);
          }}
          onUseCurrent={() => {
            const current = conflict.current as {
              value: number | null;
              valueDate: string | null;
              note: string;
              traitId: string;
            };
            const unit = editUnit(current.traitId);
            setDraft({
              ...draft,
              version: conflict.currentVersion,
              value:
                current.valueDate ??
                String(
                  unit && current.value !== null ? fromStored(current.value, unit) : current.value,
                ),
              note: current.note,
            });
            setConflict(null);
          }}
        />
      ) : null}
      {problem ? (
        <p role="alert" className="font-medium text-frost-600">
          {problem}
        </p>
      ) : null}
      {observations.isPending ? (
        <Spinner label="Loading observations…" />
      ) : observations.error ? (
        <ErrorPanel error={observations.error} />
      ) : (
        <div className="overflow-x-auto rounded-lg bg-white shadow-sm">
          <table className="w-full min-w-[48rem] text-left text-sm">
            <caption className="p-2 text-left text-loam-700">{rows.length} observations</caption>
            <thead className="bg-leaf-50">
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => (
                    <th key={h.id} className="p-2">
                      {h.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={h.column.getToggleSortingHandler()}
                          className="min-h-11 font-semibold"
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}
                          {h.column.getIsSorted() === 'asc'
                            ? ' ▲'
                            : h.column.getIsSorted() === 'desc'
                              ? ' ▼'
                              : ''}
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  ))}
                  {canWrite ? <th className="p-2">Change</th> : null}
                </tr>
              ))}
            </thead>
            <tbody>
              {rows.map((row) => {
                const o = row.original;
                const editing = draft?.id === o.id;
                const unit = editUnit(o.traitId);
                return (
                  <tr
                    key={row.id}
                    className={`border-t border-leaf-50 ${editing ? 'bg-straw-50' : ''}`}
                  >
                    {row.getVisibleCells().map((c) => (
                      <td key={c.id} className="p-2">
                        {editing && c.column.id === 'value' ? (
                          <input
                            aria-label={`Value${unit ? ` (${unit})` : ''}`}
                            inputMode={o.valueDate ? undefined : 'decimal'}
                            type={o.valueDate ? 'date' : 'text'}
                            value={draft.value}
                            onChange={(e) => setDraft({ ...draft, value: e.target.value })}
                            className={cell}
                          />
                        ) : editing && c.column.id === 'note' ? (
                          <input
                            aria-label="Note"
                            value={draft.note}
                            onChange={(e) => setDraft({ ...draft, note: e.target.value })}
                            className={cell}
                          />
                        ) : (
                          flexRender(c.column.columnDef.cell, c.getContext())
                        )}
                      </td>
                    ))}
                    {canWrite ? (
                      <td className="flex gap-1 p-1">
                        {editing ? (
                          <>
                            <button
                              type="button"
                              onClick={() => void save(o)}
                              className="min-h-11 rounded-lg bg-leaf-700 px-3 font-semibold text-white"
                            >
                              Save
                            </button>
                            <button
                              type="button"
                              onClick={() => setDraft(null)}
                              className="min-h-11 rounded-lg px-2 text-leaf-700"
                            >
                              Cancel
                            </button>
                          </>
                        ) : (
                          <>
                            <button
                              type="button"
                              onClick={() =>
                                setDraft({
                                  id: o.id,
                                  version: o.version,
                                  value:
                                    o.valueDate ??
                                    String(
                                      o.value === null
                                        ? ''
                                        : unit
                                          ? Math.round(fromStored(o.value, unit) * 100) / 100
                                          : o.value,
                                    ),
                                  note: o.note,
                                })
                              }
                              className="min-h-11 rounded-lg px-2 text-leaf-700 underline"
                            >
                              Edit
                            </button>
                            <button
                              type="button"
                              onClick={async () => {
                                await remove.mutateAsync(o.id);
                                setDeleted(o);
                              }}
                              className="min-h-11 rounded-lg px-2 text-frost-600 underline"
                            >
                              Delete
                            </button>
                          </>
                        )}
                      </td>
                    ) : null}
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      {deleted ? (
        <UndoToast
          message={`Deleted ${deleted.traitLabel} of plot ${deleted.plotNumber}.`}
          busy={undo.isPending}
          onClose={() => setDeleted(null)}
          onUndo={async () => {
            try {
              await undo.mutateAsync(deleted.id);
            } catch (err) {
              setProblem(err instanceof Error ? err.message : 'Could not undo.');
            }
            setDeleted(null);
          }}
        />
      ) : null}
    </article>
  );
}

import type { Observation } from '@common/contracts/records';
import { columnUnit, formatScaled } from '@common/display-units';
import { observationDoubt } from '@common/plausibility';
import { decimalsInUnit, exportNumber, recordedDecimals } from '@common/precision';
import { fromStored, type QuantityUnit, toStored } from '@common/units';
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
import { useObservations, useUpdateObservation } from '../api/record-api';
import {
  DoubtFlag,
  EditActions,
  editCell,
  FilterInput,
  FilterSelect,
  RecordLogShell,
  RowActions,
  SiteFilter,
  SortButton,
  useRecordLog,
} from '../components/record-log';

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
  const observations = useObservations(slug, { siteId: siteId || undefined });
  const update = useUpdateObservation(slug);
  const log = useRecordLog<Observation>(slug, 'observations');
  /**
   * Each trait's one unit and precision in this table, chosen from all its values shown (a
   * height in cm on every row, never cm on one row and m on the next).
   */
  const traitColumns = useMemo(() => {
    const all = observations.data?.observations ?? [];
    return new Map(
      (trial.data?.traits ?? []).map((t) => {
        const values = all.flatMap((o) =>
          o.traitId === t.id && o.value !== null ? [o.value] : [],
        );
        const col = columnUnit(t.quantityKind, units, values, t.displayUnit);
        return [t.id, { trait: t, ...col, decimals: recordedDecimals(values) }] as const;
      }),
    );
  }, [trial.data, observations.data, units]);
  const editUnit = (traitOf: string): QuantityUnit | null =>
    traitColumns.get(traitOf)?.unit ?? null;
  const unitLabel = (traitOf: string) => traitColumns.get(traitOf)?.shown.label ?? '';
  const show = (o: Observation) => {
    if (o.valueDate) return o.valueDate;
    const col = traitColumns.get(o.traitId);
    if (o.value === null || !col) return '—';
    return (
      <>
        {formatScaled(o.value, col.shown, col.decimals)}
        <DoubtFlag
          doubts={[observationDoubt(o.value, col.trait, units)].filter((d) => d !== null)}
        />
      </>
    );
  };
  const typedValue = (value: number, traitOf: string) => {
    const col = traitColumns.get(traitOf);
    if (!col?.unit) return String(value);
    return exportNumber(
      fromStored(value, col.unit),
      decimalsInUnit(col.decimals, col.shown.factor),
    );
  };

  const columns = useMemo<ColumnDef<Observation>[]>(
    () => [
      { accessorKey: 'observedOn', header: 'Date' },
      { accessorKey: 'siteName', header: 'Site' },
      { accessorKey: 'plotNumber', header: 'Plot' },
      { id: 'entry', accessorFn: (o) => `${o.entryName} (${o.entryCode})`, header: 'Entry' },
      {
        accessorKey: 'traitLabel',
        header: 'Trait',
        cell: (c) => {
          const label = unitLabel(c.row.original.traitId);
          return label ? `${c.getValue<string>()} (${label})` : c.getValue<string>();
        },
      },
      { accessorKey: 'plantNumber', header: 'Plant' },
      {
        id: 'value',
        accessorFn: (o) => o.value ?? o.valueDate,
        // With one trait shown, the heading names its unit once.
        header: traitId && unitLabel(traitId) ? `Value (${unitLabel(traitId)})` : 'Value',
        cell: (c) => show(c.row.original),
      },
      { accessorKey: 'note', header: 'Note', enableSorting: false },
      { accessorKey: 'updatedByName', header: 'By' },
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [units, traitColumns, traitId],
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
      log.setConflict(null);
      log.setProblem(null);
    } catch (err) {
      log.refused(err);
    }
  };

  return (
    <RecordLogShell
      heading={`Observation log · ${trial.data.title}`}
      slug={slug}
      log={log}
      filters={
        <>
          <SiteFilter sites={trial.data.sites} value={siteId} onChange={setSiteId} />
          <FilterSelect label="Trait" value={traitId} onChange={setTraitId}>
            <option value="">All traits</option>
            {trial.data.traits.map((t) => (
              <option key={t.id} value={t.id}>
                {t.label}
              </option>
            ))}
          </FilterSelect>
          <FilterInput label="Search" value={search} onChange={setSearch} />
        </>
      }
      editing={draft !== null}
      onCancelEdit={() => setDraft(null)}
      onUseCurrent={(conflict) => {
        const current = conflict.current as {
          value: number | null;
          valueDate: string | null;
          note: string;
          traitId: string;
        };
        setDraft({
          ...draft!,
          version: conflict.currentVersion,
          value:
            current.valueDate ??
            (current.value === null ? '' : typedValue(current.value, current.traitId)),
          note: current.note,
        });
      }}
      query={observations}
      loadingLabel="Loading observations…"
      deletedMessage={(d) => `Deleted ${d.traitLabel} of plot ${d.plotNumber}.`}
    >
      <table className="w-full min-w-[48rem] text-left text-sm">
        <caption className="p-2 text-left text-loam-700">{rows.length} observations</caption>
        <thead className="bg-leaf-50">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => (
                <th key={h.id} className="p-2">
                  {h.column.getCanSort() ? (
                    <SortButton header={h} className="min-h-11 font-semibold" />
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
                        className={editCell}
                      />
                    ) : editing && c.column.id === 'note' ? (
                      <input
                        aria-label="Note"
                        value={draft.note}
                        onChange={(e) => setDraft({ ...draft, note: e.target.value })}
                        className={editCell}
                      />
                    ) : (
                      flexRender(c.column.columnDef.cell, c.getContext())
                    )}
                  </td>
                ))}
                {canWrite ? (
                  <td className="flex gap-1 p-1">
                    {editing ? (
                      <EditActions onSave={() => void save(o)} onCancel={() => setDraft(null)} />
                    ) : (
                      <RowActions
                        onEdit={() =>
                          setDraft({
                            id: o.id,
                            version: o.version,
                            value:
                              o.valueDate ??
                              (o.value === null ? '' : typedValue(o.value, o.traitId)),
                            note: o.note,
                          })
                        }
                        onDelete={() => void log.remove(o)}
                      />
                    )}
                  </td>
                ) : null}
              </tr>
            );
          })}
        </tbody>
      </table>
    </RecordLogShell>
  );
}

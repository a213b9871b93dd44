import type { Harvest } from '@common/contracts/records';
import { fromStored, toStored } from '@common/units';
import { readNumberField } from '@common/decimal';
import { columnUnit, formatInUnit, formatScaled } from '@common/display-units';
import { harvestChecks, harvestDoubts } from '@common/plausibility';
import { decimalsInUnit, exportNumber, recordedDecimals } from '@common/precision';
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
import { useHarvests, useUpdateHarvest } from '../api/record-api';
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

interface Draft {
  id: string;
  version: number;
  harvestedOn: string;
  fruitCount: string;
  mass: string;
  grade: 'marketable' | 'cull';
  note: string;
}

/** The harvest log: filter, sort, edit in place (a stale edit is refused with 409), delete with undo. */
export function Component() {
  const { slug = '' } = useParams();
  const trial = useTrial(slug);
  const units = useUnitSystem();
  const [siteId, setSiteId] = useState('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const [search, setSearch] = useState('');
  const [grade, setGrade] = useState('');
  const [sorting, setSorting] = useState<SortingState>([{ id: 'harvestedOn', desc: true }]);
  const [draft, setDraft] = useState<Draft | null>(null);
  const harvests = useHarvests(slug, {
    siteId: siteId || undefined,
    from: from || undefined,
    to: to || undefined,
  });
  const update = useUpdateHarvest(slug);
  const log = useRecordLog<Harvest>(slug, 'harvests');
  const canWrite = trial.data?.permissions['records.write'] ?? false;
  const traits = useMemo(() => trial.data?.traits ?? [], [trial.data]);
  // One mass unit and precision for the whole column, chosen from all the harvests shown.
  const { massUnit, shown, decimals } = useMemo(() => {
    const masses = (harvests.data?.harvests ?? []).map((h) => h.massG);
    const col = columnUnit('mass', units, masses, harvestChecks(traits).massUnit);
    return { massUnit: col.unit!, shown: col.shown, decimals: recordedDecimals(masses) };
  }, [harvests.data, units, traits]);
  const typedMass = (g: number) =>
    exportNumber(fromStored(g, massUnit), decimalsInUnit(decimals, shown.factor));

  const startEdit = (h: Harvest) => {
    log.setConflict(null);
    log.setProblem(null);
    setDraft({
      id: h.id,
      version: h.version,
      harvestedOn: h.harvestedOn,
      fruitCount: String(h.fruitCount),
      mass: typedMass(h.massG),
      grade: h.grade,
      note: h.note,
    });
  };

  const save = async () => {
    if (!draft) return;
    log.setProblem(null);
    try {
      await update.mutateAsync({
        id: draft.id,
        body: {
          version: draft.version,
          harvestedOn: draft.harvestedOn,
          fruitCount: readNumberField(draft.fruitCount) ?? Number.NaN,
          massG: toStored(readNumberField(draft.mass) ?? Number.NaN, massUnit),
          grade: draft.grade,
          note: draft.note,
        },
      });
      setDraft(null);
    } catch (err) {
      log.refused(err);
    }
  };

  const columns = useMemo<ColumnDef<Harvest>[]>(
    () => [
      { accessorKey: 'harvestedOn', header: 'Date' },
      { accessorKey: 'siteName', header: 'Site' },
      { accessorKey: 'plotNumber', header: 'Plot' },
      { id: 'entry', accessorFn: (h) => `${h.entryName} (${h.entryCode})`, header: 'Entry' },
      { accessorKey: 'fruitCount', header: 'Fruit' },
      {
        accessorKey: 'massG',
        header: `Mass (${shown.label})`,
        cell: (c) => (
          <>
            {formatScaled(c.getValue<number>(), shown, decimals)}
            <DoubtFlag doubts={harvestDoubts(c.row.original, traits, units)} />
          </>
        ),
      },
      { accessorKey: 'grade', header: 'Grade' },
      { accessorKey: 'note', header: 'Note', enableSorting: false },
      { accessorKey: 'updatedByName', header: 'By' },
    ],
    [units, shown, decimals, traits],
  );
  // Filtered here rather than by the table's filter model, which re-rendered without end
  // once a row was in edit mode.
  const data = useMemo(() => {
    const q = search.trim().toLowerCase();
    return (harvests.data?.harvests ?? []).filter(
      (h) =>
        (!grade || h.grade === grade) &&
        (!q ||
          [
            h.entryName,
            h.entryCode,
            h.note,
            h.siteName,
            String(h.plotNumber),
            h.updatedByName ?? '',
          ]
            .join(' ')
            .toLowerCase()
            .includes(q)),
    );
  }, [harvests.data, grade, search]);
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
  const rows = table.getRowModel().rows;
  const total = rows.reduce((a, r) => a + r.original.massG, 0);

  return (
    <RecordLogShell
      heading={`Harvest log · ${trial.data.title}`}
      slug={slug}
      log={log}
      filters={
        <>
          <SiteFilter sites={trial.data.sites} value={siteId} onChange={setSiteId} />
          <FilterInput label="From" type="date" value={from} onChange={setFrom} />
          <FilterInput label="To" type="date" value={to} onChange={setTo} />
          <FilterSelect label="Grade" value={grade} onChange={setGrade}>
            <option value="">Both</option>
            <option value="marketable">Marketable</option>
            <option value="cull">Cull</option>
          </FilterSelect>
          <FilterInput label="Search entry, note…" value={search} onChange={setSearch} />
        </>
      }
      editing={draft !== null}
      onCancelEdit={() => setDraft(null)}
      onUseCurrent={(conflict) => {
        const c = conflict.current as unknown as Harvest;
        setDraft({
          ...draft!,
          version: conflict.currentVersion,
          harvestedOn: String(c.harvestedOn),
          fruitCount: String(c.fruitCount),
          mass: typedMass(Number(c.massG)),
          grade: c.grade,
          note: String(c.note ?? ''),
        });
      }}
      query={harvests}
      loadingLabel="Loading harvests…"
      deletedMessage={(d) => `Deleted the harvest of plot ${d.plotNumber} (${d.harvestedOn}).`}
    >
      <table className="w-full min-w-[48rem] text-left text-sm">
        <caption className="p-2 text-left text-loam-700">
          {rows.length} harvests · {formatInUnit(total, shown, decimals)} in total
        </caption>
        <thead className="bg-leaf-50">
          {table.getHeaderGroups().map((hg) => (
            <tr key={hg.id}>
              {hg.headers.map((h) => (
                <th
                  key={h.id}
                  className="p-2"
                  aria-sort={
                    h.column.getIsSorted() === 'asc'
                      ? 'ascending'
                      : h.column.getIsSorted() === 'desc'
                        ? 'descending'
                        : undefined
                  }
                >
                  {h.column.getCanSort() ? (
                    <SortButton
                      header={h}
                      className="min-h-11 font-semibold underline-offset-2 hover:underline"
                    />
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
            const h = row.original;
            if (draft?.id === h.id)
              return (
                <tr key={row.id} className="border-t border-leaf-50 bg-straw-50">
                  <td className="p-1">
                    <input
                      aria-label="Date"
                      type="date"
                      value={draft.harvestedOn}
                      onChange={(e) => setDraft({ ...draft, harvestedOn: e.target.value })}
                      className={editCell}
                    />
                  </td>
                  <td className="p-2">{h.siteName}</td>
                  <td className="p-2">{h.plotNumber}</td>
                  <td className="p-2">{h.entryName}</td>
                  <td className="p-1">
                    <input
                      aria-label="Fruit count"
                      inputMode="numeric"
                      value={draft.fruitCount}
                      onChange={(e) => setDraft({ ...draft, fruitCount: e.target.value })}
                      className={editCell}
                    />
                  </td>
                  <td className="p-1">
                    <input
                      aria-label={`Mass (${massUnit})`}
                      inputMode="decimal"
                      value={draft.mass}
                      onChange={(e) => setDraft({ ...draft, mass: e.target.value })}
                      className={editCell}
                    />
                  </td>
                  <td className="p-1">
                    <select
                      aria-label="Grade"
                      value={draft.grade}
                      onChange={(e) =>
                        setDraft({ ...draft, grade: e.target.value as Draft['grade'] })
                      }
                      className={editCell}
                    >
                      <option value="marketable">marketable</option>
                      <option value="cull">cull</option>
                    </select>
                  </td>
                  <td className="p-1">
                    <input
                      aria-label="Note"
                      value={draft.note}
                      onChange={(e) => setDraft({ ...draft, note: e.target.value })}
                      className={editCell}
                    />
                  </td>
                  <td className="p-2">{h.updatedByName}</td>
                  <td className="flex gap-1 p-1">
                    <EditActions
                      onSave={() => void save()}
                      onCancel={() => setDraft(null)}
                      saving={update.isPending}
                    />
                  </td>
                </tr>
              );
            return (
              <tr key={row.id} className="border-t border-leaf-50">
                {row.getVisibleCells().map((c) => (
                  <td key={c.id} className="p-2">
                    {flexRender(c.column.columnDef.cell, c.getContext())}
                  </td>
                ))}
                {canWrite ? (
                  <td className="flex gap-1 p-1">
                    <RowActions
                      onEdit={() => startEdit(h)}
                      onDelete={() => void log.remove(h)}
                      editLabel={`Edit harvest of plot ${h.plotNumber} on ${h.harvestedOn}`}
                      deleteLabel={`Delete harvest of plot ${h.plotNumber} on ${h.harvestedOn}`}
                    />
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

/**
 * The import's two tables: the rows read from the file (what each would record, in the
 * reader's units) and the problems that keep the file out (row, column, message).
 */
import type { UnitSystem } from '@common/contracts/me';
import type { ImportPreview, ImportRowError } from '@common/contracts/records';
import type { TraitDisplayUnit } from '@common/contracts/trials';
import { columnUnit, formatScaled } from '@common/display-units';
import { recordedDecimals } from '@common/precision';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';

type PreviewRow = ImportPreview['rows'][number];
/** A row of the file may make several records (a recording sheet): each keeps its place. */
type ReadRow = PreviewRow & { place: number };

const statusWords: Record<PreviewRow['status'], string> = {
  new: 'new',
  already_recorded: 'already recorded',
  error: 'problem',
};

const problemCol = createColumnHelper<ImportRowError>();
const problemColumns = [
  problemCol.accessor('row', { header: 'Row', meta: { align: 'right' } }),
  problemCol.accessor('column', {
    header: 'Column',
    meta: { cellClassName: () => 'font-mono' },
  }),
  problemCol.accessor('message', { header: 'Problem', enableSorting: false }),
];

export function ImportProblems({ errors }: { errors: ImportRowError[] }) {
  return (
    <ScrollRegion label="Problems in the file">
      <DataTable
        showCaption
        caption={
          <span className="text-frost-600">
            Problems (nothing will be imported until they are fixed)
          </span>
        }
        className="min-w-[24rem]"
        data={errors}
        rowId={(e) => `${e.row}:${e.column}:${e.message}`}
        rowHeader="row"
        columns={problemColumns}
      />
    </ScrollRegion>
  );
}

const rowCol = createColumnHelper<ReadRow>();

/**
 * The rows read: harvests show fruit and mass (one mass unit for the column, chosen from the
 * file's masses), observations their value in their trait's one unit (named beside the trait,
 * or in the heading when the file holds one trait).
 */
export function ImportRowsRead({
  rows,
  traits,
  units,
}: {
  rows: PreviewRow[];
  traits: { key: string; quantityKind: string; displayUnit: TraitDisplayUnit | null }[];
  units: UnitSystem;
}) {
  const harvests = rows.flatMap((r) => (r.record.kind === 'harvest' ? [r.record] : []));
  const observations = rows.flatMap((r) => (r.record.kind === 'observation' ? [r.record] : []));
  const masses = harvests.map((h) => h.massG);
  const mass = columnUnit('mass', units, masses);
  const massDecimals = recordedDecimals(masses);
  const traitUnits = new Map(
    traits.map((t) => {
      const values = observations.flatMap((o) =>
        o.traitKey === t.key && o.value !== null ? [o.value] : [],
      );
      const col = columnUnit(t.quantityKind, units, values, t.displayUnit);
      return [t.key, { shown: col.shown, decimals: recordedDecimals(values) }] as const;
    }),
  );
  const unitOf = (key: string) => traitUnits.get(key)?.shown.label ?? '';
  const oneTrait = observations.every((o) => o.traitKey === observations[0]?.traitKey)
    ? observations[0]?.traitKey
    : undefined;
  const named = (label: string, unit: string) => (unit ? `${label} (${unit})` : label);
  const columns = [
    rowCol.accessor('row', { header: 'Row', meta: { align: 'right' } }),
    rowCol.accessor('plotLabel', { header: 'Plot' }),
    rowCol.accessor((r) => r.record.date, { id: 'date', header: 'Date' }),
    rowCol.accessor(
      (r) =>
        r.record.kind === 'harvest'
          ? `Harvest, ${r.record.grade}`
          : `${oneTrait ? r.record.traitLabel : named(r.record.traitLabel, unitOf(r.record.traitKey))}${r.record.plantNumber ? `, plant ${r.record.plantNumber}` : ''}`,
      { id: 'record', header: 'Record' },
    ),
    ...(harvests.length
      ? [
          rowCol.accessor((r) => (r.record.kind === 'harvest' ? r.record.fruitCount : undefined), {
            id: 'fruit',
            header: 'Fruit',
            cell: (c) => c.getValue() ?? '—',
            sortUndefined: 'last',
            meta: { align: 'right' },
          }),
          rowCol.accessor((r) => (r.record.kind === 'harvest' ? r.record.massG : undefined), {
            id: 'mass',
            header: named('Mass', mass.shown.label),
            cell: (c) => formatScaled(c.getValue(), mass.shown, massDecimals),
            sortUndefined: 'last',
            meta: { align: 'right' },
          }),
        ]
      : []),
    ...(observations.length
      ? [
          rowCol.accessor(
            (r) => (r.record.kind === 'observation' ? (r.record.value ?? undefined) : undefined),
            {
              id: 'value',
              header: oneTrait ? named('Value', unitOf(oneTrait)) : 'Value',
              cell: ({ row: { original: r } }) => {
                if (r.record.kind !== 'observation') return '—';
                if (r.record.valueDate) return r.record.valueDate;
                const col = traitUnits.get(r.record.traitKey);
                return col ? formatScaled(r.record.value, col.shown, col.decimals) : '—';
              },
              sortUndefined: 'last',
              meta: { align: 'right' },
            },
          ),
        ]
      : []),
    rowCol.accessor((r) => statusWords[r.status], { id: 'status', header: 'Status' }),
  ];
  return (
    <ScrollRegion label="Rows read" className="max-h-80 overflow-y-auto">
      <DataTable
        showCaption
        caption="Rows read"
        className="min-w-[36rem]"
        data={rows.map((r, place) => ({ ...r, place }))}
        rowId={(r) => String(r.place)}
        rowHeader="row"
        columns={columns}
      />
    </ScrollRegion>
  );
}

import type { TwoFactor } from '@common/contracts/analysis';
import { type DisplayUnit, formatScaled } from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';

type MeanWithSe = { mean: number; se: number };
interface Row {
  variety: string;
  cells: Record<string, MeanWithSe | undefined>;
  overall: MeanWithSe | undefined;
}

const column = createColumnHelper<Row>();

/**
 * A two-factor trait's cell means: one row per entry, one column per level of the treatment
 * (named as the lead named it), and the entry's mean over all levels; the treatment's own means
 * below. Mean ± SE in the trait's display unit. The comparison view and the results sheet show
 * the same table.
 */
export function CellMeansTable({
  twoFactor,
  varieties,
  traitLabel,
  unit,
  decimals,
}: {
  twoFactor: Pick<TwoFactor, 'factor' | 'levels' | 'cellMeans' | 'varietyMeans' | 'treatmentMeans'>;
  /** The entries in the order the rows start in. */
  varieties: string[];
  traitLabel: string;
  unit: DisplayUnit;
  decimals: number;
}) {
  const shown = (m: MeanWithSe | undefined) =>
    m ? `${formatScaled(m.mean, unit, decimals)} ± ${formatScaled(m.se, unit, decimals)}` : '—';
  const rows: Row[] = varieties.map((variety) => ({
    variety,
    cells: Object.fromEntries(
      twoFactor.levels.map((level) => [
        level,
        twoFactor.cellMeans.find((c) => c.variety === variety && c.treatment === level),
      ]),
    ),
    overall: twoFactor.varietyMeans.find((m) => m.variety === variety),
  }));
  const factor = twoFactor.factor.toLowerCase();
  const columns = [
    column.accessor('variety', { header: 'Variety' }),
    ...twoFactor.levels.map((level) =>
      column.accessor((r) => r.cells[level]?.mean, {
        id: `level:${level}`,
        header: level,
        sortUndefined: 'last',
        meta: { align: 'right' },
        cell: ({ row }) => shown(row.original.cells[level]),
      }),
    ),
    column.accessor((r) => r.overall?.mean, {
      id: 'overall',
      header: `Over all levels`,
      sortUndefined: 'last',
      meta: { align: 'right' },
      cell: ({ row }) => shown(row.original.overall),
    }),
  ];
  return (
    <div data-cell-means={twoFactor.factor}>
      <ScrollRegion label={`Cell means, variety × ${factor}`} className="mt-2 rounded-lg bg-white">
        <DataTable
          showCaption
          className="min-w-[24rem]"
          caption={
            <>
              Cell means: {traitLabel}
              {unit.label ? ` (${unit.label})` : ''}, variety × {factor}
              <span className="block text-xs font-normal text-loam-700">
                Mean ± SE of each variety at each level of {factor}, and over all levels.
              </span>
            </>
          }
          data={rows}
          columns={columns}
          rowId={(r) => r.variety}
          rowHeader="variety"
        />
      </ScrollRegion>
      <p className="mt-1 text-sm">
        {twoFactor.factor} means:{' '}
        {twoFactor.treatmentMeans.map((m) => `${m.treatment} ${shown(m)}`).join('; ')}
        {unit.label ? ` ${unit.label}` : ''}
      </p>
    </div>
  );
}

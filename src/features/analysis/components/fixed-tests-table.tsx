import { ddfMethodLabels, type TwoFactor } from '@common/contracts/analysis';
import { formatF, formatP } from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { ScrollRegion } from '@/components/ui/scroll-region';

type FixedTest = NonNullable<TwoFactor['fixedTests']>[number];
const col = createColumnHelper<FixedTest>();

/** A split plot's mixed-model tests: one Wald F per fixed term, in the order they were fitted. */
export function FixedTestsTable({ tests, factor }: { tests: FixedTest[]; factor: string }) {
  const label = (source: FixedTest['source']) => {
    switch (source) {
      case 'treatment':
        return factor;
      case 'variety':
        return 'Variety';
      case 'variety:treatment':
        return `Variety × ${factor.toLowerCase()}`;
      default: {
        const never: never = source;
        return never;
      }
    }
  };
  return (
    <ScrollRegion label="Mixed-model tests" className="mt-3">
      <DataTable
        showCaption
        sortable={false}
        className="min-w-[28rem]"
        caption={`Wald F tests (sequential, ${ddfMethodLabels[tests[0]?.method ?? 'satterthwaite']} denominator df)`}
        data={tests}
        rowId={(t) => t.source}
        rowHeader="source"
        columns={[
          col.accessor((t) => label(t.source), { id: 'source', header: 'Source' }),
          col.accessor('numDf', { header: 'Num df', meta: { align: 'right' } }),
          col.accessor('denDf', {
            header: 'Den df',
            cell: (c) => c.getValue().toFixed(1),
            meta: { align: 'right' },
          }),
          col.accessor('f', {
            header: 'F',
            cell: (c) => formatF(c.getValue()),
            meta: { align: 'right' },
          }),
          col.accessor('p', {
            header: 'p',
            cell: (c) => formatP(c.getValue()),
            meta: { align: 'right' },
          }),
        ]}
      />
    </ScrollRegion>
  );
}

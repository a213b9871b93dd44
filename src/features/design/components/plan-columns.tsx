import type { Design } from '@common/contracts/design';
import type { UnitSystem } from '@common/contracts/me';
import { formatNumber, spacingDisplayUnit, withUnit } from '@common/display-units';
import { createColumnHelper } from '@tanstack/react-table';

type PlanPlot = Design['plots'][number];
const planCol = createColumnHelper<PlanPlot>();

/** The plot plan's columns. Field order is the default; a reader may sort by any column (e.g. to find one entry's plots). */
export function planColumns(design: Design, system: UnitSystem) {
  const entry = new Map(design.entries.map((e) => [e.id, e]));
  const spacing = spacingDisplayUnit(system);
  return [
    planCol.accessor('plotNumber', { id: 'plot', header: 'Plot' }),
    ...(design.layout.blocks
      ? [
          planCol.accessor((p) => p.replicate ?? undefined, {
            id: 'replicate',
            header: 'Replicate',
            cell: (c) => c.getValue() ?? '—',
            sortUndefined: 'last' as const,
          }),
        ]
      : []),
    planCol.accessor('block', { header: 'Block' }),
    ...(design.factor
      ? [
          planCol.accessor((p) => p.treatment ?? undefined, {
            id: 'treatment',
            header: design.factor.name,
            sortUndefined: 'last' as const,
            cell: (c) => c.getValue() ?? '—',
          }),
        ]
      : []),
    planCol.accessor((p) => entry.get(p.entryId)?.code, {
      id: 'entry',
      header: 'Entry',
      cell: ({ row: { original: p } }) => (
        <>
          <span className="font-mono font-semibold">{entry.get(p.entryId)?.code}</span>{' '}
          {entry.get(p.entryId)?.name}
        </>
      ),
    }),
    planCol.accessor((p) => p.inRowSpacingMm ?? undefined, {
      id: 'spacing',
      header: withUnit('In-row spacing', spacing),
      cell: (c) => {
        const mm = c.getValue();
        return mm ? formatNumber(mm * spacing.factor) : '—';
      },
      sortUndefined: 'last' as const,
      meta: { align: 'right' },
    }),
    planCol.accessor((p) => p.plannedPlants ?? undefined, {
      id: 'planned',
      header: 'Plants planned',
      cell: (c) => c.getValue() ?? '—',
      sortUndefined: 'last' as const,
      meta: { align: 'right' },
    }),
  ];
}

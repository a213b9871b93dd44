import type { ColumnHelper } from '@tanstack/react-table';

/** The rank column of a ranked table: 1 = best; "—" where the trait has no direction. */
export function rankColumn<Row extends { rank: number | null }>(col: ColumnHelper<Row>) {
  return col.accessor((r) => r.rank ?? undefined, {
    id: 'rank',
    header: 'Rank',
    cell: (c) => c.getValue() ?? '—',
    // Unranked entries (no direction) sort last either way.
    sortUndefined: 'last',
    meta: { align: 'right' },
  });
}

/**
 * The one table for rows of data (on @tanstack/react-table): a reader sorts by a column's header
 * button (keyboard; aria-sort says the order), and may thin the columns out. Rows whose order
 * is the content (a ranking, an ANOVA table) turn sorting off. The row's naming column can be
 * its row header. Put it in a `ScrollRegion` with a label for narrow screens; print styles
 * (src/styles/index.css) show it whole. Only layouts made to be printed and written on stay
 * plain tables.
 */
import {
  type ColumnDef,
  type ColumnMeta,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  type Row,
  type SortingState,
  useReactTable,
  type VisibilityState,
} from '@tanstack/react-table';
import { type ReactNode, useId, useState } from 'react';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData, TValue> {
    /** Extra classes for this column's cells, from the row (e.g. a "missing" highlight). */
    cellClassName?: (row: TData) => string;
    /** Numbers line up on the right, in the header as in the cells. */
    align?: 'right';
    /** Attributes for this column's cells, from the row (e.g. the raw value as `data-*`). */
    cellProps?: (row: TData) => Record<`data-${string}`, string | number | undefined>;
  }
}

export interface DataTableProps<T> {
  /** The table's name; read by screen readers, and shown above it with `showCaption`. */
  caption: ReactNode;
  showCaption?: boolean;
  data: T[];
  columns: ColumnDef<T, any>[];
  rowId: (row: T) => string;
  /** The column whose cell names the row (rendered as a row header). */
  rowHeader?: string;
  /** Offer a choice of which columns to show. */
  chooseColumns?: boolean;
  /** False where the order of the rows is itself the content. */
  sortable?: boolean;
  /**
   * Rows that arrive already sorted (by the server, across pages): the headers show and change
   * this order and the table keeps the rows as given. One column at a time, never none.
   */
  sort?: { state: SortingState; onChange: (next: SortingState) => void };
  /** A new set of rows is on its way (aria-busy). */
  busy?: boolean;
  /** Extra classes for the table (e.g. a minimum width before it scrolls sideways). */
  className?: string;
  /** Extra classes for a row (e.g. a rule above a totals row, a card's grid on a phone). */
  rowClassName?: (row: T) => string;
  /**
   * Below this width each row is a card: the header row is left to screen readers, and the
   * cells say their own column names (a form's inputs carry their labels).
   */
  cardsBelow?: 'sm';
}

const ariaSort = { asc: 'ascending', desc: 'descending' } as const;

export function DataTable<T>({
  caption,
  data,
  columns,
  rowId,
  rowHeader,
  chooseColumns = false,
  showCaption = false,
  sortable = true,
  sort,
  busy,
  className = '',
  rowClassName,
  cardsBelow,
}: DataTableProps<T>) {
  const [ownSorting, setOwnSorting] = useState<SortingState>([]);
  const sorting = sort?.state ?? ownSorting;
  const [columnVisibility, setColumnVisibility] = useState<VisibilityState>({});
  const table = useReactTable({
    data,
    columns,
    state: { sorting, columnVisibility },
    onSortingChange: (change) => {
      const next = typeof change === 'function' ? change(sorting) : change;
      if (sort) sort.onChange(next);
      else setOwnSorting(next);
    },
    manualSorting: sort !== undefined,
    enableSortingRemoval: sort === undefined,
    enableMultiSort: sort === undefined,
    onColumnVisibilityChange: setColumnVisibility,
    enableSorting: sortable,
    getRowId: (row: T) => rowId(row),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const id = useId();
  const alignClass = (align: 'right' | undefined) => (align === 'right' ? 'text-right' : '');
  const cellClass = (row: Row<T>, meta: ColumnMeta<T, unknown> | undefined) =>
    `p-2 tabular-nums ${alignClass(meta?.align)} ${meta?.cellClassName ? meta.cellClassName(row.original) : ''}`;
  return (
    <>
      {chooseColumns ? (
        <fieldset className="border-b border-leaf-50 p-2 text-sm" aria-describedby={`${id}-cols`}>
          <legend id={`${id}-cols`} className="font-semibold text-loam-700">
            Columns shown
          </legend>
          <div className="flex flex-wrap gap-x-4">
            {table.getAllLeafColumns().map((column) => (
              <label key={column.id} className="inline-flex min-h-11 items-center gap-2">
                <input
                  type="checkbox"
                  checked={column.getIsVisible()}
                  disabled={column.id === rowHeader}
                  onChange={column.getToggleVisibilityHandler()}
                />
                {typeof column.columnDef.header === 'string' ? column.columnDef.header : column.id}
              </label>
            ))}
          </div>
        </fieldset>
      ) : null}
      <table className={`w-full text-left text-sm ${className}`} aria-busy={busy || undefined}>
        <caption className={showCaption ? 'p-2 text-left font-semibold text-leaf-900' : 'sr-only'}>
          {caption}
        </caption>
        <thead className={`bg-leaf-50 ${cardsBelow === 'sm' ? 'max-sm:sr-only' : ''}`}>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th
                    key={header.id}
                    scope="col"
                    className={`p-2 ${alignClass(header.column.columnDef.meta?.align)}`}
                    aria-sort={sorted ? ariaSort[sorted] : undefined}
                  >
                    {header.column.getCanSort() ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className="inline-flex min-h-11 items-center gap-1 font-semibold underline-offset-2 hover:underline"
                      >
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden="true">
                          {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                        </span>
                      </button>
                    ) : (
                      flexRender(header.column.columnDef.header, header.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => (
            <tr
              key={row.id}
              className={`border-t border-leaf-50 ${rowClassName ? rowClassName(row.original) : ''}`}
            >
              {row.getVisibleCells().map((cell) => {
                const content = flexRender(cell.column.columnDef.cell, cell.getContext());
                const className = cellClass(row, cell.column.columnDef.meta);
                const props = cell.column.columnDef.meta?.cellProps?.(row.original);
                return cell.column.id === rowHeader ? (
                  <th key={cell.id} scope="row" className={`${className} font-semibold`} {...props}>
                    {content}
                  </th>
                ) : (
                  <td key={cell.id} className={className} {...props}>
                    {content}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </>
  );
}

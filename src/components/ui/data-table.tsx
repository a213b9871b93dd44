/**
 * The one table for lists a reader sorts, or thins out by choosing columns (on
 * @tanstack/react-table). Headers are buttons (keyboard) carrying aria-sort; the row's first
 * column can be its row header. Print-only layouts stay plain tables.
 */
import {
  type ColumnDef,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  type Row,
  type SortingState,
  useReactTable,
  type VisibilityState,
} from '@tanstack/react-table';
import { useId, useState } from 'react';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData, TValue> {
    /** Extra classes for this column's cells, from the row (e.g. a "missing" highlight). */
    cellClassName?: (row: TData) => string;
  }
}

export interface DataTableProps<T> {
  caption: string;
  data: T[];
  columns: ColumnDef<T, any>[];
  rowId: (row: T) => string;
  /** The column whose cell names the row (rendered as a row header). */
  rowHeader?: string;
  /** Offer a choice of which columns to show. */
  chooseColumns?: boolean;
}

const ariaSort = { asc: 'ascending', desc: 'descending' } as const;

export function DataTable<T>({
  caption,
  data,
  columns,
  rowId,
  rowHeader,
  chooseColumns = false,
}: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [columnVisibility, setColumnVisibility] = useState<VisibilityState>({});
  const table = useReactTable({
    data,
    columns,
    state: { sorting, columnVisibility },
    onSortingChange: setSorting,
    onColumnVisibilityChange: setColumnVisibility,
    getRowId: (row: T) => rowId(row),
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const id = useId();
  const cellClass = (row: Row<T>, extra?: (r: T) => string) =>
    `p-2 tabular-nums ${extra ? extra(row.original) : ''}`;
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
      <table className="w-full text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-leaf-50">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th
                    key={header.id}
                    scope="col"
                    className="p-2"
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
            <tr key={row.id} className="border-t border-leaf-50">
              {row.getVisibleCells().map((cell) => {
                const content = flexRender(cell.column.columnDef.cell, cell.getContext());
                const className = cellClass(row, cell.column.columnDef.meta?.cellClassName);
                return cell.column.id === rowHeader ? (
                  <th key={cell.id} scope="row" className={`${className} font-semibold`}>
                    {content}
                  </th>
                ) : (
                  <td key={cell.id} className={className}>
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

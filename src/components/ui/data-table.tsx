import { useState, type ReactNode } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type RowData,
  type SortingState,
} from '@tanstack/react-table';

declare module '@tanstack/react-table' {
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Numbers and dates sit right-aligned so their figures line up. */
    align?: 'left' | 'right';
    /** A fixed width class for the column, e.g. 'w-24'. */
    width?: string;
  }
}

interface DataTableProps<T> {
  data: T[];
  columns: ColumnDef<T, any>[];
  /** Text every row is filtered by (all columns with string values). */
  filter?: string;
  initialSorting?: SortingState;
  empty: ReactNode;
  getRowId?: (row: T) => string;
  rowClassName?: (row: T) => string;
}

/** A dense, sortable table for engineers: small type, tabular figures, numbers right-aligned. */
export function DataTable<T>({ data, columns, filter, initialSorting = [], empty, getRowId, rowClassName }: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: filter ?? '' },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    globalFilterFn: 'includesString',
    getRowId,
  });
  const rows = table.getRowModel().rows;

  return (
    <div className="overflow-x-auto rounded-lg border border-paper-line bg-paper-raised">
      <table className="w-full border-collapse text-[13px]">
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id} className="border-b border-paper-line bg-paper-sunk/60">
              {group.headers.map((header) => {
                const meta = header.column.columnDef.meta;
                const right = meta?.align === 'right';
                const sorted = header.column.getIsSorted();
                const canSort = header.column.getCanSort();
                return (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                    className={`px-3 py-2 align-middle text-[11px] leading-4 font-semibold tracking-wide text-ink-soft uppercase ${right ? 'text-right' : 'text-left'} ${meta?.width ?? ''}`}
                  >
                    {header.isPlaceholder ? null : canSort ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className={`inline-flex items-center gap-1 align-middle leading-4 tracking-wide uppercase hover:text-ink ${right ? 'flex-row-reverse' : ''}`}
                      >
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden className={`inline-block w-3 text-center text-ink-faint ${sorted ? '' : 'invisible'}`}>
                          {sorted === 'desc' ? '↓' : '↑'}
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
          {rows.length === 0 ? (
            <tr>
              <td colSpan={table.getAllLeafColumns().length} className="px-3 py-8 text-center text-sm text-ink-soft">
                {empty}
              </td>
            </tr>
          ) : (
            rows.map((row) => (
              <tr key={row.id} className={`border-b border-paper-line/70 last:border-b-0 hover:bg-paper/70 ${rowClassName?.(row.original) ?? ''}`}>
                {row.getVisibleCells().map((cell) => {
                  const meta = cell.column.columnDef.meta;
                  return (
                    <td key={cell.id} className={`px-3 py-1.5 align-middle ${meta?.align === 'right' ? 'text-right whitespace-nowrap' : 'text-left'}`}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))
          )}
        </tbody>
      </table>
    </div>
  );
}

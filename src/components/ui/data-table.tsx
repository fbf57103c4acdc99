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

/**
 * A dense, sortable table for engineers: 28 px rows, 13 px type, tabular figures, numbers
 * right-aligned, headers in sentence case with the unit in the header ("Force, kN").
 */
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
    // Ruled, not boxed: a 1 px graphite rule over and under the table, the header ruled off below,
    // hairlines between rows (docs/visual-language.md, "Tables").
    <div className="overflow-x-auto border-y border-ink-soft bg-paper-raised">
      <table className="w-full border-collapse text-[13px] leading-[18px]">
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id} className="border-b border-ink-soft">
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
                    className={`px-2.5 pt-2 pb-1.5 align-bottom text-[12px] leading-4 font-semibold text-ink-soft ${right ? 'text-right' : 'text-left'} ${meta?.width ?? ''}`}
                  >
                    {header.isPlaceholder ? null : canSort ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className={`inline-flex items-baseline gap-1 leading-4 hover:text-ink ${sorted ? 'text-ink' : ''} ${right ? 'flex-row-reverse' : ''}`}
                      >
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden className={`inline-block w-3 text-center text-ink-faint ${sorted ? '' : 'invisible'}`}>
                          {sorted === 'desc' ? '▾' : '▴'}
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
              <td colSpan={table.getAllLeafColumns().length} className="px-2.5 py-4 text-left text-sm text-ink-soft">
                {empty}
              </td>
            </tr>
          ) : (
            rows.map((row) => (
              <tr key={row.id} className={`h-7 border-b border-paper-line last:border-b-0 hover:bg-paper-sunk/60 ${rowClassName?.(row.original) ?? ''}`}>
                {row.getVisibleCells().map((cell) => {
                  const meta = cell.column.columnDef.meta;
                  return (
                    <td key={cell.id} className={`px-2.5 py-1 align-middle ${meta?.align === 'right' ? 'text-right whitespace-nowrap tabular-nums' : 'text-left'}`}>
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

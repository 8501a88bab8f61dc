import { useState, type ReactNode } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type RowData,
  type SortingState,
} from '@tanstack/react-table';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Right-aligned, monospaced figures. */
    numeric?: boolean;
    /** Keep the cell on one line and as narrow as its content (actions). */
    shrink?: boolean;
  }
}

type DataTableProps<T> = {
  data: T[];
  columns: ColumnDef<T, unknown>[];
  /** Visible name of the table for assistive technology. */
  label: string;
  initialSort?: SortingState;
  empty?: ReactNode;
  rowClassName?: (row: T) => string;
  getRowId?: (row: T) => string;
  /** Column ids not to show (for example the grower column on a grower's own page). */
  hiddenColumns?: string[];
};

const sortMark = { asc: '▲', desc: '▼' } as const;

/** A dense, sortable table on TanStack Table. Headers are buttons; `aria-sort` says the current order. */
export function DataTable<T>({
  data,
  columns,
  label,
  initialSort = [],
  empty,
  rowClassName,
  getRowId,
  hiddenColumns = [],
}: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSort);
  const table = useReactTable({
    data,
    columns,
    state: { sorting, columnVisibility: Object.fromEntries(hiddenColumns.map((c) => [c, false])) },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId,
  });
  if (data.length === 0 && empty) return <>{empty}</>;
  return (
    <div className="relative overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
      <table className="w-full border-collapse text-sm" aria-label={label}>
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id} className="border-b border-ink-line bg-paper-sunk/60">
              {group.headers.map((header) => {
                const meta = header.column.columnDef.meta;
                const sorted = header.column.getIsSorted();
                const canSort = header.column.getCanSort();
                const content = header.isPlaceholder
                  ? null
                  : flexRender(header.column.columnDef.header, header.getContext());
                return (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={
                      sorted === 'asc'
                        ? 'ascending'
                        : sorted === 'desc'
                          ? 'descending'
                          : canSort
                            ? 'none'
                            : undefined
                    }
                    className={`px-3 py-1.5 text-xs font-medium text-ink-soft ${meta?.numeric ? 'text-right' : 'text-left'} ${meta?.shrink ? 'w-px whitespace-nowrap' : ''}`}
                  >
                    {canSort ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className={`inline-flex cursor-pointer items-center gap-1 rounded-sm hover:text-ink ${meta?.numeric ? 'flex-row-reverse' : ''} ${sorted ? 'text-ink' : ''}`}
                      >
                        {content}
                        <span
                          className={`text-[0.6rem] ${sorted ? 'text-clay-600' : 'text-ink-line'}`}
                          aria-hidden
                        >
                          {sorted ? sortMark[sorted] : '▲'}
                        </span>
                      </button>
                    ) : (
                      content
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
              className={`border-b border-ink-line/70 last:border-b-0 hover:bg-paper ${rowClassName?.(row.original) ?? ''}`}
            >
              {row.getVisibleCells().map((cell) => {
                const meta = cell.column.columnDef.meta;
                return (
                  <td
                    key={cell.id}
                    className={`px-3 py-1.5 align-middle ${meta?.numeric ? 'text-right font-mono tabular-nums' : ''} ${meta?.shrink ? 'w-px whitespace-nowrap' : ''}`}
                  >
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

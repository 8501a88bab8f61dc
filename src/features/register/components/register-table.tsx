import type { ColumnDef, SortingState } from '@tanstack/react-table';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { archivedRowClass } from './columns';

/** A register list: sorted by name unless told otherwise, archived rows dimmed, an explanation when empty. */
export function RegisterTable<T extends { id: string; archivedAt: string | null }>({
  label,
  data,
  columns,
  hiddenColumns,
  empty,
  initialSort = [{ id: 'name', desc: false }],
}: {
  label: string;
  data: T[];
  columns: ColumnDef<T, unknown>[];
  hiddenColumns?: string[];
  empty: { title: string; text: string };
  initialSort?: SortingState;
}) {
  return (
    <DataTable
      label={label}
      data={data}
      columns={columns}
      hiddenColumns={hiddenColumns}
      initialSort={initialSort}
      getRowId={(r) => r.id}
      rowClassName={archivedRowClass}
      empty={<EmptyState title={empty.title}>{empty.text}</EmptyState>}
    />
  );
}

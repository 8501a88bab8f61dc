import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import type { zoneMapSummarySchema } from '@shared/schemas/zone-map.schema';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { formatDateTime } from '@/lib/format';

export type ZoneMapSummary = z.infer<typeof zoneMapSummarySchema>;

export const SOURCE_WORDS: Record<ZoneMapSummary['source'], string> = {
  drawn: 'Drawn',
  imported: 'From a file',
  'from-data': 'From data',
};

const link = 'font-medium text-ink underline-offset-2 hover:text-clay-700 hover:underline';

/** Zone maps with their version numbers, newest version first within each field and season. */
export function ZoneMapTable({
  items,
  hiddenColumns,
  empty,
}: {
  items: ZoneMapSummary[];
  hiddenColumns?: string[];
  empty: string;
}) {
  const columns: ColumnDef<ZoneMapSummary, unknown>[] = [
    {
      id: 'name',
      header: 'Zone map',
      accessorFn: (m) => m.name,
      cell: ({ row }) => (
        <Link to={`/zone-maps/${row.original.id}`} className={link}>
          {row.original.name}
        </Link>
      ),
    },
    {
      id: 'version',
      header: 'Version',
      accessorFn: (m) => m.versionNo,
      meta: { numeric: true },
      cell: ({ getValue }) => `v${getValue() as number}`,
    },
    {
      id: 'field',
      header: 'Field',
      accessorFn: (m) => m.fieldName,
      cell: ({ row }) => (
        <Link
          to={`/fields/${row.original.fieldId}`}
          className="text-ink-soft underline-offset-2 hover:text-clay-700 hover:underline"
        >
          {row.original.fieldName}
        </Link>
      ),
    },
    { id: 'season', header: 'Crop season', accessorFn: (m) => m.seasonLabel },
    { id: 'zones', header: 'Zones', accessorFn: (m) => m.zoneCount, meta: { numeric: true } },
    { id: 'source', header: 'Made', accessorFn: (m) => SOURCE_WORDS[m.source] },
    {
      id: 'updated',
      header: 'Last changed',
      accessorFn: (m) => m.updatedAt,
      cell: ({ getValue }) => formatDateTime(getValue() as string),
    },
  ];
  return (
    <DataTable
      label="Zone maps"
      data={items}
      columns={columns}
      hiddenColumns={hiddenColumns}
      getRowId={(m) => m.id}
      initialSort={[
        { id: 'season', desc: true },
        { id: 'version', desc: true },
      ]}
      empty={<EmptyState title="No zone maps yet">{empty}</EmptyState>}
    />
  );
}

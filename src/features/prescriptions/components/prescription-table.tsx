import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { PrescriptionSummary } from '@shared/schemas/prescription.schema';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { formatDate } from '@/lib/format';
import { rateWords } from './rate-values';
import { StatusBadge } from './status-badge';

const link = 'font-medium text-ink underline-offset-2 hover:text-clay-700 hover:underline';
const quiet = 'text-ink-soft underline-offset-2 hover:text-clay-700 hover:underline';

/** Prescriptions with their field, season, product, version, state and mean rate (in its own unit). */
export function PrescriptionTable({
  items,
  hiddenColumns,
  empty,
}: {
  items: PrescriptionSummary[];
  hiddenColumns?: string[];
  empty: { title: string; text: string };
}) {
  const columns: ColumnDef<PrescriptionSummary, unknown>[] = [
    {
      id: 'name',
      header: 'Prescription',
      accessorFn: (p) => p.name,
      sortingFn: 'text',
      cell: ({ row }) => (
        <Link to={`/prescriptions/${row.original.id}`} className={link}>
          {row.original.name}
        </Link>
      ),
    },
    {
      id: 'field',
      header: 'Field',
      accessorFn: (p) => p.fieldName,
      sortingFn: 'text',
      cell: ({ row }) => (
        <Link to={`/fields/${row.original.fieldId}`} className={quiet}>
          {row.original.fieldName}
        </Link>
      ),
    },
    { id: 'farm', header: 'Farm', accessorFn: (p) => p.farmName, sortingFn: 'text' },
    {
      id: 'grower',
      header: 'Grower',
      accessorFn: (p) => p.growerName,
      sortingFn: 'text',
      cell: ({ row }) => (
        <Link to={`/growers/${row.original.growerId}`} className={quiet}>
          {row.original.growerName}
        </Link>
      ),
    },
    { id: 'season', header: 'Crop season', accessorFn: (p) => p.seasonLabel, sortingFn: 'text' },
    { id: 'product', header: 'Product', accessorFn: (p) => p.productName, sortingFn: 'text' },
    {
      id: 'version',
      header: 'Version',
      accessorFn: (p) => p.versionNo,
      meta: { numeric: true },
      cell: ({ getValue }) => `v${getValue() as number}`,
    },
    {
      id: 'status',
      header: 'State',
      accessorFn: (p) => p.status,
      cell: ({ row }) => <StatusBadge status={row.original.status} />,
    },
    {
      id: 'rate',
      header: 'Mean rate',
      accessorFn: (p) => p.meanRateSi,
      meta: { numeric: true },
      cell: ({ row }) => (
        <span className="whitespace-nowrap">{rateWords(row.original.meanRateSi, row.original.rateUnit)}</span>
      ),
    },
    {
      id: 'updated',
      header: 'Updated',
      accessorFn: (p) => p.updatedAt,
      cell: ({ getValue }) => (
        <span className="whitespace-nowrap text-ink-soft">{formatDate(getValue() as string)}</span>
      ),
    },
  ];
  return (
    <DataTable
      label="Prescriptions"
      data={items}
      columns={columns}
      hiddenColumns={hiddenColumns}
      getRowId={(p) => p.id}
      initialSort={[{ id: 'updated', desc: true }]}
      rowClassName={(p) => (p.status === 'superseded' ? 'text-ink-faint' : '')}
      empty={<EmptyState title={empty.title}>{empty.text}</EmptyState>}
    />
  );
}

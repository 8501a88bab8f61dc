import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { PrescriptionSummary } from '@shared/schemas/prescription.schema';
import { ButtonLink } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { QueryState } from '@/components/ui/query-state';
import { formatDate } from '@/lib/format';
import { useReadyToExport } from '../api/get-prescriptions';

const newestFirst = (a: PrescriptionSummary, b: PrescriptionSummary) =>
  (b.approvedAt ?? '').localeCompare(a.approvedAt ?? '');

/**
 * Approved prescriptions, newest approval first: each opens on its page, where the files for the planter's
 * display are exported. `limit` cuts a long list short with a link to all of them.
 */
export function ReadyToExport({
  showGrower,
  limit,
  empty,
}: {
  showGrower: boolean;
  limit?: number;
  empty: string;
}) {
  const approved = useReadyToExport();
  const columns: ColumnDef<PrescriptionSummary, unknown>[] = [
    {
      id: 'field',
      header: 'Field',
      accessorFn: (p) => p.fieldName,
      cell: ({ row }) => (
        <Link
          to={`/prescriptions/${row.original.id}`}
          className="font-medium text-ink underline-offset-2 hover:text-clay-700 hover:underline"
        >
          {row.original.fieldName}
        </Link>
      ),
    },
    { id: 'farm', header: 'Farm', accessorFn: (p) => p.farmName },
    { id: 'grower', header: 'Grower', accessorFn: (p) => p.growerName },
    {
      id: 'prescription',
      header: 'Prescription',
      accessorFn: (p) => p.name,
      cell: ({ row }) => (
        <>
          {row.original.name} <span className="text-xs text-ink-soft">{row.original.seasonLabel}</span>
        </>
      ),
    },
    { id: 'product', header: 'Product', accessorFn: (p) => p.productName },
    {
      id: 'version',
      header: 'Version',
      accessorFn: (p) => p.versionNo,
      meta: { numeric: true },
      cell: ({ getValue }) => `v${getValue() as number}`,
    },
    {
      id: 'approved',
      header: 'Approved',
      accessorFn: (p) => p.approvedAt ?? '',
      cell: ({ getValue }) => formatDate(getValue() as string),
    },
    {
      id: 'open',
      header: () => <span className="sr-only">Open</span>,
      enableSorting: false,
      meta: { shrink: true },
      cell: ({ row }) => (
        <ButtonLink
          size="sm"
          to={`/prescriptions/${row.original.id}`}
          aria-label={`Export ${row.original.name} for ${row.original.fieldName}`}
        >
          Export…
        </ButtonLink>
      ),
    },
  ];
  return (
    <QueryState query={approved} loadingLabel="Loading approved prescriptions…">
      {(items) => {
        const sorted = [...items].sort(newestFirst);
        const shown = limit ? sorted.slice(0, limit) : sorted;
        return (
          <>
            <DataTable
              label="Ready to export"
              data={shown}
              columns={columns}
              hiddenColumns={showGrower ? [] : ['grower']}
              getRowId={(p) => p.id}
              empty={<EmptyState title="Nothing approved yet">{empty}</EmptyState>}
            />
            {shown.length < sorted.length ? (
              <Link
                to="/prescriptions?status=approved"
                className="mt-1 inline-block text-sm text-clay-700 underline-offset-2 hover:underline"
              >
                All {sorted.length} approved prescriptions
              </Link>
            ) : null}
          </>
        );
      }}
    </QueryState>
  );
}

import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { Log } from '@shared/schemas/as-applied.schema';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { formatDateTime, formatNumber } from '@/lib/format';
import { LogStatusCell } from './log-status';

const link = 'font-medium text-ink underline-offset-2 hover:text-clay-700 hover:underline';
const quiet = 'text-ink-soft underline-offset-2 hover:text-clay-700 hover:underline';

/** A file size in the largest unit that keeps it above one ("3.4 MB"). */
export function formatBytes(n: number) {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${formatNumber(n / 1024, 1)} KB`;
  return `${formatNumber(n / 1024 / 1024, 1)} MB`;
}

const count = (n: number | null) => (n == null ? '—' : formatNumber(n));

/** As-applied logs with their field, season, planter, prescription, file, state and points; rows open the audit. */
export function LogTable({
  items,
  empty,
  growerNames,
}: {
  items: Log[];
  empty: { title: string; text: string };
  /** Names of the growers by id, when the reader sees more than one (a column of its own). */
  growerNames?: Map<string, string>;
}) {
  const columns: ColumnDef<Log, unknown>[] = [
    {
      id: 'field',
      header: 'Field',
      accessorFn: (l) => l.fieldName,
      sortingFn: 'text',
      cell: ({ row }) => (
        <Link to={`/logs/${row.original.id}/audit`} className={link}>
          {row.original.fieldName}
        </Link>
      ),
    },
    ...(growerNames
      ? [
          {
            id: 'grower',
            header: 'Grower',
            accessorFn: (l: Log) => growerNames.get(l.growerId) ?? '',
            sortingFn: 'text' as const,
          },
        ]
      : []),
    { id: 'season', header: 'Crop season', accessorFn: (l) => l.seasonLabel, sortingFn: 'text' },
    { id: 'planter', header: 'Planter', accessorFn: (l) => l.planterName, sortingFn: 'text' },
    {
      id: 'prescription',
      header: 'Prescription',
      accessorFn: (l) => l.prescriptionLabel,
      sortingFn: 'text',
      cell: ({ row }) => (
        <Link to={`/prescriptions/${row.original.prescriptionId}`} className={quiet}>
          {row.original.prescriptionLabel}
        </Link>
      ),
    },
    {
      id: 'file',
      header: 'File',
      accessorFn: (l) => l.fileName,
      sortingFn: 'text',
      cell: ({ row }) => (
        <span className="block max-w-52 truncate" title={row.original.fileName}>
          {row.original.fileName}
        </span>
      ),
    },
    {
      id: 'size',
      header: 'Size',
      accessorFn: (l) => l.sizeBytes,
      meta: { numeric: true },
      cell: ({ getValue }) => <span className="whitespace-nowrap">{formatBytes(getValue() as number)}</span>,
    },
    {
      id: 'status',
      header: 'State',
      accessorFn: (l) => l.status,
      cell: ({ row }) => <LogStatusCell log={row.original} />,
    },
    {
      id: 'read',
      header: 'Points read',
      accessorFn: (l) => l.pointsRead ?? -1,
      meta: { numeric: true },
      cell: ({ row }) => count(row.original.pointsRead),
    },
    {
      id: 'kept',
      header: 'Kept',
      accessorFn: (l) => l.pointsKept ?? -1,
      meta: { numeric: true },
      cell: ({ row }) => count(row.original.pointsKept),
    },
    {
      id: 'created',
      header: 'Uploaded',
      accessorFn: (l) => l.createdAt,
      cell: ({ getValue }) => (
        <span className="whitespace-nowrap text-ink-soft">{formatDateTime(getValue() as string)}</span>
      ),
    },
  ];
  return (
    <DataTable
      label="Logs"
      data={items}
      columns={columns}
      getRowId={(l) => l.id}
      initialSort={[{ id: 'created', desc: true }]}
      empty={<EmptyState title={empty.title}>{empty.text}</EmptyState>}
    />
  );
}

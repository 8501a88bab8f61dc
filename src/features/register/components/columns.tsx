import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { areaToDisplay, areaUnitLabel, type UnitSystem } from '@shared/units';
import { Badge } from '@/components/ui/badge';
import { ButtonLink } from '@/components/ui/button';
import { formatDate, formatNumber } from '@/lib/format';
import type { RegisterResource } from '../api/keys';
import { ArchiveAction } from './archive-action';

type Named = { id: string; name: string; archivedAt: string | null };

const linkClass = 'font-medium text-ink underline-offset-2 hover:text-clay-700 hover:underline';

/** The record's name, linked to its page, with an "Archived" mark when it is. */
export function nameColumn<T extends Named>(to: (row: T) => string, header = 'Name'): ColumnDef<T, unknown> {
  return {
    id: 'name',
    header,
    accessorFn: (r) => r.name,
    sortingFn: 'text',
    cell: ({ row }) => (
      <span className="inline-flex items-center gap-2">
        <Link to={to(row.original)} className={linkClass}>
          {row.original.name}
        </Link>
        {row.original.archivedAt ? <Badge>Archived</Badge> : null}
      </span>
    ),
  };
}

/** A name of a parent record (grower, farm, field), linked to it. */
export function parentColumn<T>(
  id: string,
  header: string,
  name: (row: T) => string,
  to: (row: T) => string,
): ColumnDef<T, unknown> {
  return {
    id,
    header,
    accessorFn: name,
    sortingFn: 'text',
    cell: ({ row }) => (
      <Link
        to={to(row.original)}
        className="text-ink-soft underline-offset-2 hover:text-clay-700 hover:underline"
      >
        {name(row.original)}
      </Link>
    ),
  };
}

export function textColumn<T>(
  id: string,
  header: string,
  value: (row: T) => string | null,
): ColumnDef<T, unknown> {
  return {
    id,
    header,
    accessorFn: (r) => value(r) ?? '',
    sortingFn: 'text',
    cell: ({ getValue }) => (getValue() as string) || '—',
  };
}

/** Figures: right-aligned, monospaced, sorted as numbers with empty values last. */
export function numberColumn<T>(
  id: string,
  header: string,
  value: (row: T) => number | null,
  format: (v: number) => string = (v) => formatNumber(v),
): ColumnDef<T, unknown> {
  return {
    id,
    header,
    accessorFn: (r) => value(r) ?? undefined,
    sortUndefined: 'last',
    meta: { numeric: true },
    cell: ({ getValue }) => {
      const v = getValue() as number | undefined;
      return v === undefined ? <span className="text-ink-faint">—</span> : format(v);
    },
  };
}

/** An area in m², shown in acres or hectares with one decimal. */
export const areaColumn = <T,>(system: UnitSystem, value: (row: T) => number | null) =>
  numberColumn<T>('area', `Area (${areaUnitLabel(system)})`, value, (m2) =>
    formatNumber(areaToDisplay(m2, system), 1),
  );

export function updatedColumn<T extends { updatedAt: string }>(): ColumnDef<T, unknown> {
  return {
    id: 'updated',
    header: 'Updated',
    accessorFn: (r) => r.updatedAt,
    cell: ({ getValue }) => <span className="text-ink-soft">{formatDate(getValue() as string)}</span>,
  };
}

/** Edit and archive/restore, for the rows the user may change. */
export function actionsColumn<T extends Named>(
  resource: RegisterResource,
  editTo: (row: T) => string,
  canEdit: (row: T) => boolean,
): ColumnDef<T, unknown> {
  return {
    id: 'actions',
    header: () => <span className="sr-only">Actions</span>,
    enableSorting: false,
    meta: { shrink: true },
    cell: ({ row }) =>
      canEdit(row.original) ? (
        <span className="flex justify-end gap-1">
          {row.original.archivedAt ? null : (
            <ButtonLink
              size="sm"
              variant="ghost"
              to={editTo(row.original)}
              aria-label={`Edit ${row.original.name}`}
            >
              Edit
            </ButtonLink>
          )}
          <ArchiveAction
            resource={resource}
            id={row.original.id}
            name={row.original.name}
            archived={!!row.original.archivedAt}
          />
        </span>
      ) : null,
  };
}

export const archivedRowClass = (row: { archivedAt: string | null }) =>
  row.archivedAt ? 'text-ink-faint' : '';

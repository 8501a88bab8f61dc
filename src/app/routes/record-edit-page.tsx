import type { ReactNode } from 'react';
import type { UseQueryResult } from '@tanstack/react-query';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';

type Crumb = { label: string; to?: string };

/**
 * The frame of an add-or-edit page: a role check, then either the blank form (no `query`) or the form
 * filled from the loaded record.
 */
export function RecordEditPage<T>({
  allowed,
  query,
  title,
  crumbs,
  description,
  children,
}: {
  allowed: boolean | ((record?: T) => boolean);
  query: UseQueryResult<T> | null;
  title: (record?: T) => string;
  crumbs: (record?: T) => Crumb[];
  description?: ReactNode;
  children: (record?: T) => ReactNode;
}) {
  const may = (r?: T) => (typeof allowed === 'function' ? allowed(r) : allowed);
  const page = (r?: T) =>
    may(r) ? (
      <>
        <PageHeader title={title(r)} crumbs={crumbs(r)} description={description} />
        {children(r)}
      </>
    ) : (
      <NotAllowed what={r ? 'changing this record' : 'adding records here'} />
    );
  if (!query) return page();
  return <QueryState query={query}>{(r) => page(r)}</QueryState>;
}

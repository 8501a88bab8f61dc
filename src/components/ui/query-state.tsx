import type { ReactNode } from 'react';
import type { UseQueryResult } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { Button, ButtonLink } from './button';
import { EmptyState } from './empty-state';
import { Loading } from './loading';
import { Notice } from './notice';

/** Says why a request failed, in words a user can act on. */
export function describeError(error: unknown): string {
  if (isApiError(error)) {
    if (error.status === 404) return 'This record does not exist, or you do not have access to it.';
    if (error.status === 403) return 'Your role does not allow this.';
    return error.message;
  }
  return error instanceof Error ? error.message : 'Something went wrong.';
}

export function ErrorNotice({ error, onRetry }: { error: unknown; onRetry?: () => void }) {
  return (
    <Notice tone="danger" title="Could not load this">
      <div className="flex flex-wrap items-center gap-3">
        <span>{describeError(error)}</span>
        {onRetry ? (
          <Button size="sm" onClick={onRetry}>
            Try again
          </Button>
        ) : null}
      </div>
    </Notice>
  );
}

/** Shows loading and error states of a query, and its data once there. */
export function QueryState<T>({
  query,
  children,
  loadingLabel,
}: {
  query: UseQueryResult<T>;
  children: (data: T) => ReactNode;
  loadingLabel?: string;
}) {
  if (query.isPending) return <Loading label={loadingLabel} />;
  if (query.isError) {
    if (isApiError(query.error) && query.error.status === 404) {
      return (
        <EmptyState title="Nothing here" action={<ButtonLink to="/">Back to the overview</ButtonLink>}>
          {describeError(query.error)}
        </EmptyState>
      );
    }
    return <ErrorNotice error={query.error} onRetry={() => void query.refetch()} />;
  }
  return <>{children(query.data)}</>;
}

import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

/** When a page fails to load or throws while drawing. */
export function RouteError() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : 'Something went wrong.';
  const stale =
    error instanceof Error &&
    /dynamically imported module|Importing a module script failed/i.test(error.message);
  return (
    <div className="mx-auto max-w-xl py-10">
      <Notice tone="danger" title="This page could not be shown">
        <p>
          {stale
            ? 'Sowright was updated while this tab was open. Reload the page to get the new version.'
            : message}
        </p>
        <div className="mt-3 flex gap-2">
          <button type="button" className="underline" onClick={() => window.location.reload()}>
            Reload
          </button>
          <ButtonLink size="sm" to="/">
            Overview
          </ButtonLink>
        </div>
      </Notice>
    </div>
  );
}

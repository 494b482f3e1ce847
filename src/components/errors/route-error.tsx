import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { Notice } from '../ui/notice';

/** A route-level error boundary: one page failing leaves the rest of the app working. */
export function RouteError() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error)
    ? error.status === 404
      ? 'There is no page at this address.'
      : `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : 'Something went wrong while showing this page.';
  return (
    <div className="mx-auto max-w-xl p-8">
      <Notice tone="problem" title="This page could not be shown">
        <p>{message}</p>
        <p className="mt-2">
          <Link className="font-semibold underline" to="/">
            Back to the overview
          </Link>
        </p>
      </Notice>
    </div>
  );
}

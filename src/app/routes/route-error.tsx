import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { ErrorNote } from '@/components/ui/error-note';

export function RouteError() {
  const error = useRouteError();
  return (
    <div className="mx-auto max-w-lg p-6">
      <h1 className="mb-3 text-xl font-semibold">This page could not be shown</h1>
      {isRouteErrorResponse(error) ? <p>{error.status} {error.statusText}</p> : <ErrorNote error={error} />}
      <Link to="/" className="mt-4 inline-block text-accent underline">Back to the map</Link>
    </div>
  );
}

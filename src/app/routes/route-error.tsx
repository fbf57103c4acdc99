import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { EmptyState, LoadingState } from '@/components/ui/states';
import { Wordmark } from '@/components/ui/wordmark';

/** What a page that broke shows instead of a stack trace. */
export function RouteError() {
  const error = useRouteError();
  const notFound = isRouteErrorResponse(error) && error.status === 404;
  if (!notFound) console.error(error);
  return (
    <div className="mx-auto max-w-lg px-6 py-16">
      <Wordmark />
      <h1 className="mt-8 text-xl font-semibold text-ink">{notFound ? 'There is no such page' : 'This page ran into a problem'}</h1>
      <p className="mt-2 text-sm text-ink-soft">
        {notFound
          ? 'The address may be mistyped, or the page was moved.'
          : 'Reload the page and try again. If it keeps happening, tell your admin what you were doing.'}
      </p>
      <Link to="/projects" className="mt-6 inline-block text-sm font-medium text-accent hover:underline">
        Go to the projects
      </Link>
    </div>
  );
}

export function NotFoundRoute() {
  return (
    <EmptyState>
      There is no such page.{' '}
      <Link to="/projects" className="font-medium text-accent hover:underline">
        Go to the projects
      </Link>
    </EmptyState>
  );
}

export function PageLoading() {
  return (
    <div className="mx-auto max-w-lg px-6 py-16">
      <LoadingState label="Opening Panelpoint…" />
    </div>
  );
}

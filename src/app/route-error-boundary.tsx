import { isRouteErrorResponse, Link, Navigate, useLocation, useRouteError } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';

interface Explained {
  title: string;
  body: string;
}

function explain(error: unknown): Explained & { status: number | null } {
  const status = isRouteErrorResponse(error) ? error.status : isApiRequestError(error) ? error.status : null;
  if (status === 0) return { status, title: 'Cannot reach the server', body: 'This needs a network connection and there is none right now. Saved data is still available on the home screen.' };
  if (status === 403) return { status, title: 'Not available to your role', body: 'Your role in this organisation does not include this section. Ask an admin if you need it.' };
  if (status === 404) return { status, title: 'Not found', body: 'There is nothing at this address, or it belongs to an organisation you are not a member of.' };
  if (status !== null && status >= 500) return { status, title: 'The server had a problem', body: 'It has been logged. Try again in a moment.' };
  const message = error instanceof Error ? error.message : null;
  return { status, title: 'Something went wrong', body: message ?? 'The screen could not be shown.' };
}

/** Every route's error element: says what happened in words that match the HTTP status. */
export function RouteErrorBoundary() {
  const error = useRouteError();
  const location = useLocation();
  if (isApiRequestError(error) && error.status === 401) {
    return <Navigate to="/sign-in" replace state={{ from: location.pathname + location.search }} />;
  }
  const { title, body, status } = explain(error);
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-4 p-4" data-testid="route-error">
      <Alert tone={status === 0 ? 'offline' : 'danger'} title={title} role="alert">
        {body}
        {status !== null && status > 0 && <span className="mt-1 block text-sm text-fg-muted">HTTP {status}</span>}
      </Alert>
      <div className="flex flex-wrap gap-3">
        <Button onClick={() => window.location.reload()}>Try again</Button>
        <Link to="/" className="inline-flex min-h-touch items-center rounded-lg px-4 font-bold">
          Go to the home screen
        </Link>
      </div>
    </div>
  );
}

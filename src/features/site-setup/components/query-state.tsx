import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { isApiRequestError } from '@/lib/api';

interface QueryLike {
  fetchStatus: string;
  error: unknown;
  refetch: () => unknown;
}

/** What a list shows before its data is there: loading, saved-copy-missing offline, or the error. */
export function QueryState({ label, query }: { label: string; query: QueryLike }) {
  if (query.fetchStatus === 'paused') return <p className="text-fg-muted">No saved {label} on this device yet; connect to load them.</p>;
  if (query.error) {
    const message = isApiRequestError(query.error) ? query.error.message : 'Could not load.';
    return (
      <Alert tone="danger" title={`Could not load ${label}`}>
        <p>{message}</p>
        <Button variant="secondary" className="mt-2" onClick={() => void query.refetch()}>
          Try again
        </Button>
      </Alert>
    );
  }
  return <p role="status">Loading {label}…</p>;
}

import { useOnlineStatus } from '@/lib/online-status';

/** The always-visible connection state in the header. Words, not only a colour. */
export function OfflineIndicator() {
  const status = useOnlineStatus();
  if (status.online) {
    return (
      <span role="status" data-testid="connection-status" className="inline-flex items-center gap-2 text-sm text-header-muted">
        <span aria-hidden className="inline-block h-3 w-3 rounded-full border-2 border-header-muted bg-header-muted" />
        Online
      </span>
    );
  }
  const why = status.reason === 'browser-offline' ? 'no network' : 'server not reachable';
  return (
    <span
      role="status"
      data-testid="connection-status"
      className="inline-flex items-center gap-2 rounded-full bg-offline-soft px-3 py-1 text-sm font-bold text-offline"
      title={why}
    >
      <span aria-hidden className="inline-block h-3 w-3 rounded-full border-2 border-offline" />
      Offline — showing saved data
    </span>
  );
}

import { Alert } from '@/components/alert';

export function formatSavedAt(epochMs: number, now = Date.now()): string {
  const date = new Date(epochMs);
  const sameDay = new Date(now).toDateString() === date.toDateString();
  const time = date.toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit' });
  return sameDay ? `today at ${time}` : `${date.toLocaleDateString(undefined, { day: 'numeric', month: 'short', year: 'numeric' })} at ${time}`;
}

/** While offline: say plainly that these lists are the copy saved on this device, and from when. */
export function SavedDataNote({ savedAt }: { savedAt: number | null }) {
  return (
    <Alert tone="offline" title="Offline — showing saved data" role="status">
      <span data-testid="saved-at">
        {savedAt
          ? `These lists were saved on this device ${formatSavedAt(savedAt)}. They update when the network is back.`
          : 'Nothing has been saved on this device yet: connect once to load your sites and surveys.'}
      </span>
    </Alert>
  );
}

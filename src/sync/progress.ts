/** What a sync run is doing, for the header and for tests ("Pushing 120 of 480", then "Pulling…"). */
export type SyncPhase = 'pushing' | 'uploading' | 'pulling';

export interface SyncProgress {
  phase: SyncPhase;
  done: number;
  /** Known for pushing and uploading; for pulling the total is not known until the last page. */
  total: number | null;
  /** Uploads only: bytes of the files sent so far and in all. */
  bytesDone?: number;
  bytesTotal?: number;
}

const count = (n: number) => n.toLocaleString('en-GB');

export function progressText(p: SyncProgress): string {
  if (p.phase === 'pushing') return `Pushing ${count(p.done)} of ${count(p.total ?? p.done)}`;
  if (p.phase === 'uploading') {
    const share = p.bytesTotal ? ` (${Math.round(((p.bytesDone ?? 0) / p.bytesTotal) * 100)}%)` : '';
    return `Uploading file ${count(p.done)} of ${count(p.total ?? p.done)}${share}`;
  }
  return p.done > 0 ? `Pulling… ${count(p.done)} ${p.done === 1 ? 'change' : 'changes'}` : 'Pulling…';
}

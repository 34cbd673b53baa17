import type { Sweep } from '@shared/schemas/capture';
import { sweepSpec } from './save-sweep';
import { tombstoneSynced } from './write-synced';

/** Tombstone a sweep (deleted: true, revision + 1), queued for sync like an edit. */
export function deleteSweep(id: string): Promise<Sweep> {
  return tombstoneSynced(sweepSpec(), id);
}

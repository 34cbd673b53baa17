import type { Station } from '@shared/schemas/capture';
import { CaptureError, db } from '@/db';
import { stationSpec } from './save-station';
import { tombstoneSynced } from './write-synced';

/**
 * Tombstone a station. Refused while it still has live readings or sweeps: readings are facts and are
 * never removed as a side effect; delete them first (each its own tombstone) if that is what is meant.
 */
export function deleteStation(id: string): Promise<Station> {
  return tombstoneSynced(
    {
      ...stationSpec(),
      extraTables: [db.fieldReadings, db.sweeps],
      after: undefined,
      guard: async () => {
        const readings = await db.fieldReadings.where('stationId').equals(id).filter((r) => !r.deleted).count();
        const sweeps = await db.sweeps.where('stationId').equals(id).filter((s) => !s.deleted).count();
        if (readings + sweeps > 0) {
          throw new CaptureError('RECORD_CONFLICT', `This station still has ${readings} reading(s) and ${sweeps} sweep(s). Delete those first.`);
        }
      },
    },
    id,
  );
}

import { SweepSchema, type Station, type Sweep } from '@shared/schemas/capture';
import { db, toCaptureError, type SweepRow } from '@/db';
import { prepareAttachment } from './attachments';
import { stationSpec, type StationInput } from './save-station';
import { draftSynced, parseRecord, tablesFor, writeSyncedInTx } from './write-synced';

export type SweepInput = Omit<Sweep, 'id' | 'revision' | 'deleted'> & { id?: string };

export const sweepSpec = () => ({
  entity: 'sweeps' as const,
  table: db.sweeps,
  schema: SweepSchema,
  label: 'That sweep',
  extraTables: [db.attachments],
  toRow: (record: Sweep): SweepRow => record,
});

export interface SaveSweepOptions {
  /** The trace file (CSV of frequency and level), kept as an attachment. */
  trace?: Blob;
  /** The station to create with this sweep, in the same transaction (see SaveFieldReadingOptions.newStation). */
  newStation?: StationInput;
}

/** Log a spectrum sweep (no id) or correct one (its id), with the new station it was taken at and its trace, in one transaction. */
export async function saveSweepWith(input: SweepInput, options: SaveSweepOptions = {}): Promise<{ sweep: Sweep; station: Station | null }> {
  const { trace, newStation } = options;
  const station = newStation ? draftSynced(stationSpec(), newStation) : null;
  const stationId = station ? station.draft.id : input.stationId;
  parseRecord(SweepSchema, { ...input, stationId, id: input.id ?? '00000000-0000-7000-8000-000000000000', revision: 1, deleted: false });
  const attachment = trace ? await prepareAttachment(trace, 'trace', 'sweeps', input.surveyId) : null;
  const sweep = draftSynced(
    {
      ...sweepSpec(),
      after: async (record: Sweep) => {
        if (attachment) await db.attachments.put({ ...attachment, recordId: record.id });
      },
    },
    { ...input, stationId, ...(attachment ? { traceSha256: attachment.sha256, traceObjectKey: null } : {}) },
  );
  try {
    return await db.transaction('rw', tablesFor(sweep, ...(station ? [station] : [])), async (tx) => {
      const savedStation = station ? await writeSyncedInTx(station, tx) : null;
      return { sweep: await writeSyncedInTx(sweep, tx), station: savedStation };
    });
  } catch (error) {
    throw toCaptureError(error);
  }
}

/** Log a spectrum sweep (no id) or correct one (its id); an optional trace file (CSV) is kept as an attachment. */
export async function saveSweep(input: SweepInput, trace?: Blob): Promise<Sweep> {
  return (await saveSweepWith(input, trace ? { trace } : {})).sweep;
}

import { SweepSchema, type Sweep } from '@shared/schemas/capture';
import { db, type SweepRow } from '@/db';
import { prepareAttachment } from './attachments';
import { parseRecord, saveSynced } from './write-synced';

export type SweepInput = Omit<Sweep, 'id' | 'revision' | 'deleted'> & { id?: string };

export const sweepSpec = () => ({
  entity: 'sweeps' as const,
  table: db.sweeps,
  schema: SweepSchema,
  label: 'That sweep',
  extraTables: [db.attachments],
  toRow: (record: Sweep): SweepRow => record,
});

/** Log a spectrum sweep (no id) or correct one (its id); an optional trace file (CSV) is kept as an attachment. */
export async function saveSweep(input: SweepInput, trace?: Blob): Promise<Sweep> {
  parseRecord(SweepSchema, { ...input, id: input.id ?? '00000000-0000-7000-8000-000000000000', revision: 1, deleted: false });
  const attachment = trace ? await prepareAttachment(trace, 'trace', 'sweeps', input.surveyId) : null;
  return saveSynced(
    {
      ...sweepSpec(),
      after: async (record) => {
        if (attachment) await db.attachments.put({ ...attachment, recordId: record.id });
      },
    },
    attachment ? { ...input, traceSha256: attachment.sha256, traceObjectKey: null } : input,
  );
}

import { WalkSchema, type Walk } from '@shared/schemas/capture';
import { CaptureError, db } from '@/db';
import { deviceLabel, getDeviceId } from './device';
import { saveSynced } from './write-synced';

export const walkSpec = () => ({ entity: 'walks' as const, table: db.walks, schema: WalkSchema, label: 'That walk', toRow: (w: Walk) => w });

/**
 * Start (or resume) this device's walk in a survey: one open walk per survey per device, so a reload or
 * a second tap returns the open one instead of starting another.
 */
export async function startWalk(input: { surveyId: string; orgId: string; userId: string }): Promise<Walk> {
  const deviceId = await getDeviceId();
  const open = await findOpenWalk(input.surveyId, deviceId);
  if (open) return open;
  return saveSynced(walkSpec(), {
    organisationId: input.orgId,
    surveyId: input.surveyId,
    surveyorUserId: input.userId,
    deviceId,
    deviceLabel: deviceLabel(),
    startedAt: new Date().toISOString(),
    endedAt: null,
    notes: null,
  });
}

/** Close a walk (endedAt now); queued like any edit. */
export async function endWalk(walkId: string, notes?: string | null): Promise<Walk> {
  const walk = await db.walks.get(walkId);
  if (!walk || walk.deleted) throw new CaptureError('RECORD_NOT_FOUND', 'That walk is not on this device.');
  if (walk.endedAt) return walk;
  const { id, surveyId, organisationId, surveyorUserId, deviceId, deviceLabel: label, startedAt } = walk;
  return saveSynced(walkSpec(), { id, surveyId, organisationId, surveyorUserId, deviceId, deviceLabel: label, startedAt, endedAt: new Date().toISOString(), notes: notes === undefined ? walk.notes : notes });
}

export async function findOpenWalk(surveyId: string, deviceId: string): Promise<Walk | null> {
  const walks = await db.walks.where('[surveyId+deviceId]').equals([surveyId, deviceId]).toArray();
  const open = walks.filter((w) => !w.deleted && !w.endedAt).sort((a, b) => (a.startedAt < b.startedAt ? 1 : -1));
  return open[0] ?? null;
}

/**
 * Take a survey offline: download its bundle (GET /api/orgs/:orgId/surveys/:surveyId/offline) and each
 * plan's device-sized image, then store everything in one transaction, so a half-finished download
 * never leaves a survey that looks ready but is not.
 *
 * Records captured on this device and not yet synced win over the server's copy: the download never
 * overwrites a change still in the outbox.
 */
import { OfflineBundleSchema, type OfflineBundle } from '@shared/schemas/offline';
import { api, ApiRequestError } from '@/lib/api';
import { CaptureError, db, toCaptureError, type PlanImageRow } from '@/db';
import { readingFieldTesla } from '@shared/schemas/capture';

export interface TakeOfflineProgress {
  step: string;
  done: number;
  total: number;
}

export interface TakeOfflineResult {
  /** Bytes written for this survey: the bundle's JSON and the plan images. */
  bytes: number;
  /** Plans whose image the server did not give (the plan view shows the stations without a background). */
  missingPlanImages: { planId: string; levelName: string; reason: string }[];
}

export const TAKE_OFFLINE_STEPS = {
  bundle: 'Downloading the survey',
  images: 'Downloading plan images',
  saving: 'Saving on this device',
} as const;

async function fetchImage(url: string, signal?: AbortSignal): Promise<{ data: ArrayBuffer; mime: string } | { error: string }> {
  let response: Response;
  try {
    response = await fetch(url, { credentials: 'same-origin', signal });
  } catch (cause) {
    throw new CaptureError('DOWNLOAD_FAILED', 'The connection dropped while downloading plan images. Nothing was saved; try again with a network.', { cause });
  }
  if (!response.ok) return { error: response.status === 404 ? 'The server has no image for this plan yet.' : `The server answered HTTP ${response.status}.` };
  return { data: await response.arrayBuffer(), mime: response.headers.get('content-type')?.split(';')[0]?.trim() || 'application/octet-stream' };
}

export async function takeSurveyOffline(options: {
  orgId: string;
  surveyId: string;
  onProgress?: (p: TakeOfflineProgress) => void;
  signal?: AbortSignal;
}): Promise<TakeOfflineResult> {
  const { orgId, surveyId, onProgress, signal } = options;
  const report = (step: string, done: number, total: number) => onProgress?.({ step, done, total });

  report(TAKE_OFFLINE_STEPS.bundle, 0, 1);
  let bundle: OfflineBundle;
  try {
    bundle = await api.get(`/api/orgs/${orgId}/surveys/${surveyId}/offline`, OfflineBundleSchema, { signal });
  } catch (error) {
    if (error instanceof ApiRequestError) throw new CaptureError('DOWNLOAD_FAILED', error.message, { cause: error });
    throw error;
  }
  const total = 2 + bundle.plans.length;
  let done = 1;
  report(TAKE_OFFLINE_STEPS.images, done, total);

  const images: PlanImageRow[] = [];
  const missingPlanImages: TakeOfflineResult['missingPlanImages'] = [];
  for (const plan of bundle.plans) {
    const got = await fetchImage(plan.imageUrl, signal);
    if ('error' in got) {
      const levelName = bundle.levels.find((l) => l.id === plan.levelId)?.name ?? 'a level';
      missingPlanImages.push({ planId: plan.id, levelName, reason: got.error });
    } else {
      images.push({ planId: plan.id, data: got.data, mime: got.mime, bytes: got.data.byteLength, fetchedAt: new Date().toISOString() });
    }
    report(TAKE_OFFLINE_STEPS.images, ++done, total);
  }

  report(TAKE_OFFLINE_STEPS.saving, done, total);
  const bytes = new TextEncoder().encode(JSON.stringify(bundle)).byteLength + images.reduce((sum, i) => sum + i.bytes, 0);
  try {
    await storeBundle(bundle, images, bytes);
  } catch (error) {
    throw toCaptureError(error);
  }
  report(TAKE_OFFLINE_STEPS.saving, total, total);
  return { bytes, missingPlanImages };
}

async function storeBundle(bundle: OfflineBundle, images: PlanImageRow[], bytes: number): Promise<void> {
  const tables = [
    db.surveys, db.sites, db.levels, db.plans, db.planImages, db.rooms, db.sources, db.emitters, db.instruments,
    db.watchBands, db.zoneSets, db.stations, db.fieldReadings, db.sweeps, db.decisions, db.outbox,
  ];
  await db.transaction('rw', tables, async () => {
    const { survey, site } = bundle;
    const levelIds = bundle.levels.map((l) => l.id);
    const roomIds = bundle.rooms.map((r) => r.id);

    // Reference data: the bundle is the whole truth for this site, so rows it no longer lists go.
    const oldLevels = await db.levels.where('siteId').equals(site.id).primaryKeys();
    const oldPlans = oldLevels.length ? await db.plans.where('levelId').anyOf(oldLevels).primaryKeys() : [];
    const oldRooms = oldLevels.length ? await db.rooms.where('levelId').anyOf(oldLevels).primaryKeys() : [];
    const oldEmitters = oldRooms.length ? await db.emitters.where('roomId').anyOf(oldRooms).primaryKeys() : [];
    const stale = <T>(old: T[], now: T[]) => old.filter((id) => !now.includes(id));
    await db.levels.bulkDelete(stale(oldLevels, levelIds));
    const stalePlans = stale(oldPlans, bundle.plans.map((p) => p.id));
    await db.plans.bulkDelete(stalePlans);
    await db.planImages.bulkDelete(stalePlans);
    await db.rooms.bulkDelete(stale(oldRooms, roomIds));
    await db.emitters.bulkDelete(stale(oldEmitters, bundle.emitters.map((e) => e.id)));
    await db.sources.bulkDelete(stale(await db.sources.where('siteId').equals(site.id).primaryKeys(), bundle.sources.map((s) => s.id)));
    await db.instruments.bulkDelete(stale(await db.instruments.where('organisationId').equals(survey.organisationId).primaryKeys(), bundle.instruments.map((i) => i.id)));
    await db.watchBands.bulkDelete(stale(await db.watchBands.where('organisationId').equals(survey.organisationId).primaryKeys(), bundle.watchBands.map((b) => b.id)));

    await db.surveys.put({ ...survey, takenOfflineAt: new Date().toISOString(), bundleGeneratedAt: bundle.generatedAt, bytes });
    await db.sites.put(site);
    await db.levels.bulkPut(bundle.levels);
    await db.plans.bulkPut(bundle.plans);
    await db.planImages.bulkPut(images);
    await db.rooms.bulkPut(bundle.rooms);
    await db.sources.bulkPut(bundle.sources);
    await db.emitters.bulkPut(bundle.emitters);
    await db.instruments.bulkPut(bundle.instruments);
    await db.watchBands.bulkPut(bundle.watchBands);
    if (bundle.zoneSet) await db.zoneSets.put(bundle.zoneSet);
    await db.decisions.bulkPut(bundle.decisions);

    // Captured records: keep the device's copy when it has unsynced changes or a newer revision.
    const pending = new Set(await db.outbox.where('surveyId').equals(survey.id).toArray().then((rows) => rows.map((m) => m.recordId)));
    const keep = async <T extends { id: string; revision: number }>(table: { bulkGet(ids: string[]): Promise<(T | undefined)[]> }, rows: T[]) => {
      const local = await table.bulkGet(rows.map((r) => r.id));
      return rows.filter((r, i) => !pending.has(r.id) && !((local[i]?.revision ?? 0) > r.revision));
    };
    const stations = await keep(db.stations, bundle.stations);
    await db.stations.bulkPut(stations.map((s) => ({ ...s, latestFieldT: s.latestFieldT })));
    const readings = await keep(db.fieldReadings, bundle.fieldReadings);
    await db.fieldReadings.bulkPut(readings.map((r) => ({ ...r, fieldT: readingFieldTesla(r) })));
    await db.sweeps.bulkPut(await keep(db.sweeps, bundle.sweeps));

    // |B| per station from everything the device now holds (server readings and unsynced local ones).
    const newest = new Map<string, { fieldT: number; measuredAt: string }>();
    await db.fieldReadings.where('surveyId').equals(survey.id).each((r) => {
      if (r.deleted) return;
      const known = newest.get(r.stationId);
      if (!known || r.measuredAt > known.measuredAt) newest.set(r.stationId, { fieldT: r.fieldT, measuredAt: r.measuredAt });
    });
    await db.stations.where('surveyId').equals(survey.id).modify((s) => {
      s.latestFieldT = newest.get(s.id)?.fieldT ?? s.latestFieldT ?? null;
    });
  });
}

import { useLiveQuery } from 'dexie-react-hooks';
import { db, type EmitterRow, type InstrumentRow, type LevelRow, type PlanRow, type RoomRow, type SiteRow, type SourceRow, type SurveyRow, type WatchBandRow, type ZoneSetRow } from '@/db';

export interface OfflineSurvey {
  survey: SurveyRow;
  site: SiteRow;
  /** Bottom floor first. */
  levels: LevelRow[];
  plans: PlanRow[];
  rooms: RoomRow[];
  sources: SourceRow[];
  emitters: EmitterRow[];
  instruments: InstrumentRow[];
  /** The organisation-wide bands and this site's own. */
  watchBands: WatchBandRow[];
  zoneSet: ZoneSetRow | null;
  takenOfflineAt: string;
}

export async function getOfflineSurvey(surveyId: string): Promise<OfflineSurvey | null> {
  const survey = await db.surveys.get(surveyId);
  if (!survey) return null;
  const site = await db.sites.get(survey.siteId);
  if (!site) return null;
  const levels = (await db.levels.where('siteId').equals(site.id).toArray()).sort((a, b) => a.ordinal - b.ordinal || a.name.localeCompare(b.name));
  const levelIds = levels.map((l) => l.id);
  const [plans, rooms, sources, instruments, bands, zoneSet] = await Promise.all([
    db.plans.where('levelId').anyOf(levelIds).toArray(),
    db.rooms.where('levelId').anyOf(levelIds).toArray(),
    db.sources.where('siteId').equals(site.id).toArray(),
    db.instruments.where('organisationId').equals(survey.organisationId).toArray(),
    db.watchBands.where('organisationId').equals(survey.organisationId).toArray(),
    survey.zoneSetId ? db.zoneSets.get(survey.zoneSetId) : Promise.resolve(undefined),
  ]);
  const emitters = await db.emitters.where('roomId').anyOf(rooms.map((r) => r.id)).toArray();
  return {
    survey,
    site,
    levels,
    plans,
    rooms,
    sources,
    emitters,
    instruments: instruments.sort((a, b) => a.kind.localeCompare(b.kind) || a.model.localeCompare(b.model)),
    watchBands: bands.filter((b) => b.siteId === null || b.siteId === site.id).sort((a, b) => a.lowerHz - b.lowerHz),
    zoneSet: zoneSet ?? null,
    takenOfflineAt: survey.takenOfflineAt,
  };
}

/** undefined while loading, null when this survey has not been taken offline on this device. */
export function useOfflineSurvey(surveyId: string): OfflineSurvey | null | undefined {
  return useLiveQuery(() => getOfflineSurvey(surveyId), [surveyId]);
}

import { and, asc, eq, inArray, isNull, or, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import {
  decisions,
  emitters,
  fieldReadings,
  instruments,
  levels,
  plans,
  rooms,
  sites,
  sources,
  stations,
  surveyAssignments,
  surveys,
  sweeps,
  watchBands,
  zoneSets,
} from '../../db/schema';

/** Reads for the offline bundle. Every query is scoped by organisation and leaves tombstones out. */
export function createOfflineRepository(db: Db) {
  return {
    async findSurvey(organisationId: string, surveyId: string) {
      const [row] = await db
        .select()
        .from(surveys)
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    async isAssigned(organisationId: string, surveyId: string, userId: string, role: 'surveyor' | 'reviewer'): Promise<boolean> {
      const [row] = await db
        .select({ id: surveyAssignments.id })
        .from(surveyAssignments)
        .where(
          and(
            eq(surveyAssignments.organisationId, organisationId),
            eq(surveyAssignments.surveyId, surveyId),
            eq(surveyAssignments.userId, userId),
            eq(surveyAssignments.role, role),
            eq(surveyAssignments.deleted, false),
          ),
        )
        .limit(1);
      return Boolean(row);
    },

    /**
     * Everything on the survey's site and in the survey, read in one repeatable-read snapshot so the
     * parts agree. Only the levels the survey walks come with their plans and rooms; the site's
     * sources all come (a magnet on another floor still sets the field here).
     */
    async loadBundle(organisationId: string, survey: { id: string; siteId: string; zoneSetId: string | null; levelIds: string[] }) {
      return db.transaction(
        async (tx) => {
          const [site] = await tx.select().from(sites).where(and(eq(sites.organisationId, organisationId), eq(sites.id, survey.siteId))).limit(1);
          const levelRows = survey.levelIds.length
            ? await tx
                .select()
                .from(levels)
                .where(
                  and(
                    eq(levels.organisationId, organisationId),
                    eq(levels.siteId, survey.siteId),
                    inArray(levels.id, survey.levelIds),
                    eq(levels.deleted, false),
                    eq(levels.archived, false),
                  ),
                )
                .orderBy(asc(levels.ordinal), asc(levels.name))
            : [];
          const levelIds = levelRows.map((l) => l.id);
          const planRows = levelIds.length
            ? await tx.select().from(plans).where(and(eq(plans.organisationId, organisationId), inArray(plans.levelId, levelIds), eq(plans.deleted, false)))
            : [];
          const roomRows = levelIds.length
            ? await tx.select().from(rooms).where(and(eq(rooms.organisationId, organisationId), inArray(rooms.levelId, levelIds), eq(rooms.deleted, false)))
            : [];
          const roomIds = roomRows.map((r) => r.id);
          const emitterRows = roomIds.length
            ? await tx.select().from(emitters).where(and(eq(emitters.organisationId, organisationId), inArray(emitters.roomId, roomIds), eq(emitters.deleted, false)))
            : [];
          const sourceRows = await tx
            .select()
            .from(sources)
            .where(and(eq(sources.organisationId, organisationId), eq(sources.siteId, survey.siteId), eq(sources.deleted, false)));
          const instrumentRows = await tx
            .select({
              instrument: instruments,
              calibrationOverdue: sql<boolean>`coalesce(${instruments.calibrationDueOn} < current_date, false)`,
            })
            .from(instruments)
            .where(and(eq(instruments.organisationId, organisationId), eq(instruments.deleted, false)))
            .orderBy(asc(instruments.kind), asc(instruments.model), asc(instruments.serial));
          const bandRows = await tx
            .select()
            .from(watchBands)
            .where(
              and(
                eq(watchBands.organisationId, organisationId),
                eq(watchBands.deleted, false),
                or(isNull(watchBands.siteId), eq(watchBands.siteId, survey.siteId)),
              ),
            )
            .orderBy(asc(watchBands.lowerHz));
          const [zoneSet] = survey.zoneSetId
            ? await tx.select().from(zoneSets).where(and(eq(zoneSets.organisationId, organisationId), eq(zoneSets.id, survey.zoneSetId), eq(zoneSets.deleted, false))).limit(1)
            : [];
          // Correlated subqueries name the outer table explicitly: Drizzle renders a bare column without
          // its table in a single-table select, which inside the subquery would mean the inner table.
          const stationRows = await tx
            .select({
              station: stations,
              // The newest live reading by the time it was taken (device clock; the best "latest" there is).
              latestFieldT: sql<number | null>`(SELECT fr.field_t FROM ${fieldReadings} fr WHERE fr.station_id = ${stations}.id AND fr.organisation_id = ${stations}.organisation_id AND NOT fr.deleted ORDER BY fr.measured_at DESC, fr.id DESC LIMIT 1)`,
            })
            .from(stations)
            .where(and(eq(stations.organisationId, organisationId), eq(stations.surveyId, survey.id), eq(stations.deleted, false)))
            .orderBy(asc(stations.id));
          const readingRows = await tx
            .select()
            .from(fieldReadings)
            .where(and(eq(fieldReadings.organisationId, organisationId), eq(fieldReadings.surveyId, survey.id), eq(fieldReadings.deleted, false)))
            .orderBy(asc(fieldReadings.measuredAt), asc(fieldReadings.id));
          const sweepRows = await tx
            .select()
            .from(sweeps)
            .where(and(eq(sweeps.organisationId, organisationId), eq(sweeps.surveyId, survey.id), eq(sweeps.deleted, false)))
            .orderBy(asc(sweeps.measuredAt), asc(sweeps.id));
          const decisionRows = await tx
            .select({
              decision: decisions,
              stationId: sql<string>`coalesce((SELECT fr.station_id FROM ${fieldReadings} fr WHERE fr.id = ${decisions}.field_reading_id), (SELECT sw.station_id FROM ${sweeps} sw WHERE sw.id = ${decisions}.sweep_id))`,
            })
            .from(decisions)
            .where(and(eq(decisions.organisationId, organisationId), eq(decisions.surveyId, survey.id), eq(decisions.deleted, false)))
            .orderBy(asc(decisions.decidedAt));
          const [{ now } = { now: new Date() }] = await tx.select({ now: sql<Date>`now()`.mapWith((v: string | Date) => new Date(v)) }).from(sql`(SELECT 1) AS one`);
          return {
            now,
            site: site ?? null,
            levels: levelRows,
            plans: planRows,
            rooms: roomRows,
            emitters: emitterRows,
            sources: sourceRows,
            instruments: instrumentRows,
            watchBands: bandRows,
            zoneSet: zoneSet ?? null,
            stations: stationRows,
            fieldReadings: readingRows,
            sweeps: sweepRows,
            decisions: decisionRows,
          };
        },
        { isolationLevel: 'repeatable read', accessMode: 'read only' },
      );
    },
  };
}
export type OfflineRepository = ReturnType<typeof createOfflineRepository>;

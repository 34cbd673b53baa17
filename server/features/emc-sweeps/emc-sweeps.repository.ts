/**
 * Sweeps explained, database side: a survey's live sweeps with their station, room and analyser; the
 * field readings of the survey with their gaussmeter's uncertainty and latest decision; the watch bands
 * of the organisation and the survey's site that touch a span; whether a trace file has arrived.
 */
import { and, eq, gte, isNull, lte, or, sql } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { attachments, instruments, rooms, stations, surveys, sweeps, watchBands } from '../../db/schema';

export interface SweepRow {
  id: string;
  surveyId: string;
  stationId: string;
  stationLabel: string | null;
  roomId: string | null;
  roomName: string | null;
  measuredAt: Date;
  startHz: number;
  stopHz: number;
  rbwHz: number;
  vbwHz: number | null;
  referenceLevelDbm: number;
  attenuationDb: number | null;
  detector: 'peak' | 'quasi_peak' | 'average' | 'rms' | 'sample';
  peaks: { frequencyHz: number; levelDbm: number }[];
  traceObjectKey: string | null;
  traceSha256: string | null;
  notes: string | null;
  analyserId: string | null;
  analyserModel: string | null;
  analyserSerial: string | null;
  analyserRelativeUncertainty: number | null;
}

export interface SurveyReadingRow {
  stationId: string;
  roomId: string | null;
  fieldT: number;
  relativeUncertainty: number | null;
  /** The reading's latest decision, or null while none. */
  verdict: string | null;
}

export function createEmcSweepsRepository(db: Db) {
  const sweepColumns = {
    id: sweeps.id,
    surveyId: sweeps.surveyId,
    stationId: sweeps.stationId,
    stationLabel: stations.label,
    roomId: rooms.id,
    roomName: rooms.name,
    measuredAt: sweeps.measuredAt,
    startHz: sweeps.startHz,
    stopHz: sweeps.stopHz,
    rbwHz: sweeps.rbwHz,
    vbwHz: sweeps.vbwHz,
    referenceLevelDbm: sweeps.referenceLevelDbm,
    attenuationDb: sweeps.attenuationDb,
    detector: sweeps.detector,
    peaks: sweeps.peaks,
    traceObjectKey: sweeps.traceObjectKey,
    traceSha256: sweeps.traceSha256,
    notes: sweeps.notes,
    analyserId: instruments.id,
    analyserModel: instruments.model,
    analyserSerial: instruments.serial,
    analyserRelativeUncertainty: instruments.relativeUncertainty,
  };

  function sweepQuery(organisationId: string, surveyId: string) {
    return db
      .select(sweepColumns)
      .from(sweeps)
      .innerJoin(stations, and(eq(stations.id, sweeps.stationId), eq(stations.organisationId, sweeps.organisationId)))
      .leftJoin(rooms, and(eq(rooms.id, stations.roomId), eq(rooms.organisationId, sweeps.organisationId), eq(rooms.deleted, false)))
      .leftJoin(instruments, and(eq(instruments.id, sweeps.analyserId), eq(instruments.organisationId, sweeps.organisationId)))
      .where(and(eq(sweeps.organisationId, organisationId), eq(sweeps.surveyId, surveyId), eq(sweeps.deleted, false)))
      .$dynamic();
  }

  return {
    async findSurvey(organisationId: string, surveyId: string) {
      const [row] = await db
        .select({ id: surveys.id, siteId: surveys.siteId, state: surveys.state, species: surveys.species, maxHarmonic: surveys.maxHarmonic })
        .from(surveys)
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)));
      return row ?? null;
    },

    async listSweeps(organisationId: string, surveyId: string): Promise<SweepRow[]> {
      return (await sweepQuery(organisationId, surveyId).orderBy(sweeps.measuredAt, sweeps.id)) as SweepRow[];
    },

    async findSweep(organisationId: string, surveyId: string, sweepId: string): Promise<SweepRow | null> {
      const [row] = await sweepQuery(organisationId, surveyId).where(
        and(eq(sweeps.organisationId, organisationId), eq(sweeps.surveyId, surveyId), eq(sweeps.deleted, false), eq(sweeps.id, sweepId)),
      );
      return (row as SweepRow | undefined) ?? null;
    },

    /** Live readings at live stations of the survey, with the latest decision of each (rejected ones included: the service decides). */
    async surveyReadings(organisationId: string, surveyId: string): Promise<SurveyReadingRow[]> {
      const result = await db.execute<{ station_id: string; room_id: string | null; field_t: number; relative_uncertainty: number | null; verdict: string | null }>(sql`
        SELECT fr.station_id, st.room_id, fr.field_t, i.relative_uncertainty, latest.verdict
        FROM field_readings fr
        JOIN stations st ON st.id = fr.station_id AND NOT st.deleted
        LEFT JOIN instruments i ON i.id = fr.instrument_id
        LEFT JOIN (
          SELECT DISTINCT ON (field_reading_id) field_reading_id, verdict FROM decisions
          WHERE organisation_id = ${organisationId} AND survey_id = ${surveyId} AND NOT deleted AND field_reading_id IS NOT NULL
          ORDER BY field_reading_id, change_seq DESC
        ) latest ON latest.field_reading_id = fr.id
        WHERE fr.organisation_id = ${organisationId} AND fr.survey_id = ${surveyId} AND NOT fr.deleted AND fr.field_t IS NOT NULL`);
      return result.rows.map((r) => ({
        stationId: r.station_id,
        roomId: r.room_id,
        fieldT: Number(r.field_t),
        relativeUncertainty: r.relative_uncertainty === null ? null : Number(r.relative_uncertainty),
        verdict: r.verdict,
      }));
    },

    /** Live bands of the organisation (site null) and of the site whose edges touch [startHz, stopHz]. */
    async watchBandsInSpan(organisationId: string, siteId: string, startHz: number, stopHz: number) {
      return db
        .select({ id: watchBands.id, name: watchBands.name, lowerHz: watchBands.lowerHz, upperHz: watchBands.upperHz, severity: watchBands.severity, siteId: watchBands.siteId })
        .from(watchBands)
        .where(
          and(
            eq(watchBands.organisationId, organisationId),
            eq(watchBands.deleted, false),
            or(isNull(watchBands.siteId), eq(watchBands.siteId, siteId)),
            lte(watchBands.lowerHz, stopHz),
            gte(watchBands.upperHz, startHz),
          ),
        )
        .orderBy(watchBands.lowerHz, watchBands.name);
    },

    async traceArrived(organisationId: string, objectKey: string): Promise<boolean> {
      const rows = await db
        .select({ key: attachments.objectKey })
        .from(attachments)
        .where(and(eq(attachments.organisationId, organisationId), eq(attachments.objectKey, objectKey), eq(attachments.kind, 'trace')));
      return rows.length > 0;
    },
  };
}
export type EmcSweepsRepository = ReturnType<typeof createEmcSweepsRepository>;

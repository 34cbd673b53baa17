/**
 * Review's reads and writes: a survey's readings and sweeps with everything that vouches for them
 * (station, room, person, instrument, live decision, open conflict, missing attachment), decisions
 * written as synced records (so a surveyor's device pulls a re-measure request), the survey's
 * submit / sign-off / reopen, the report's data, and bulk creation of imported stations and readings.
 * Every write leaves its change_log and audit rows in the same transaction (server/db/audit.ts).
 */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { AuditContext } from '../../lib/audit-context';
import type { Db, DbOrTx, Tx } from '../../db/client';
import { recordAudit, recordChanges } from '../../db/audit';
import {
  attachments,
  decisions,
  fieldReadings,
  flags,
  instruments,
  levels,
  memberships,
  rooms,
  sites,
  stations,
  surveyAssignments,
  surveys,
  sweeps,
  syncConflicts,
  users,
  zoneSets,
} from '../../db/schema';
import { createSynced, updateSynced } from '../../db/synced-write';

export type SurveyRow = typeof surveys.$inferSelect;
export type DecisionRow = typeof decisions.$inferSelect;
export type StationRow = typeof stations.$inferSelect;
export type FieldReadingInsert = typeof fieldReadings.$inferInsert;
export type StationInsert = typeof stations.$inferInsert;

export function createReviewRepository(db: Db) {
  async function findSurvey(q: DbOrTx, organisationId: string, surveyId: string, lock = false): Promise<SurveyRow | null> {
    const base = q
      .select()
      .from(surveys)
      .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update') : await base;
    return row ?? null;
  }

  /** The live decision of each reading or sweep of the survey: the latest by decision time, then change sequence. */
  async function liveDecisions(q: DbOrTx, organisationId: string, surveyId: string): Promise<DecisionRow[]> {
    const rows = await q
      .select()
      .from(decisions)
      .where(and(eq(decisions.organisationId, organisationId), eq(decisions.surveyId, surveyId), eq(decisions.deleted, false)))
      .orderBy(asc(decisions.decidedAt), asc(decisions.changeSeq));
    const latest = new Map<string, DecisionRow>();
    for (const d of rows) latest.set((d.fieldReadingId ?? d.sweepId)!, d);
    return [...latest.values()];
  }

  async function openConflicts(q: DbOrTx, organisationId: string, surveyId: string) {
    return q
      .select({ id: syncConflicts.id, entity: syncConflicts.entity, recordId: syncConflicts.recordId })
      .from(syncConflicts)
      .where(and(eq(syncConflicts.organisationId, organisationId), eq(syncConflicts.surveyId, surveyId), eq(syncConflicts.state, 'open')));
  }

  async function readingRows(q: DbOrTx, organisationId: string, surveyId: string) {
    // Only the columns the review, report and CSV use: at 100,000 rows, parsing unused timestamps in
    // the driver costs more than the query itself.
    return q
      .select({
        reading: {
          id: fieldReadings.id,
          revision: fieldReadings.revision,
          stationId: fieldReadings.stationId,
          instrumentId: fieldReadings.instrumentId,
          surveyorUserId: fieldReadings.surveyorUserId,
          magnitudeT: fieldReadings.magnitudeT,
          bxT: fieldReadings.bxT,
          byT: fieldReadings.byT,
          bzT: fieldReadings.bzT,
          fieldT: fieldReadings.fieldT,
          unit: fieldReadings.unit,
          probeOrientation: fieldReadings.probeOrientation,
          heightM: fieldReadings.heightM,
          backgroundT: fieldReadings.backgroundT,
          zeroed: fieldReadings.zeroed,
          measuredAt: fieldReadings.measuredAt,
          notes: fieldReadings.notes,
          photoObjectKey: fieldReadings.photoObjectKey,
        },
        stationLabel: stations.label,
        levelId: stations.levelId,
        roomId: stations.roomId,
      })
      .from(fieldReadings)
      .innerJoin(stations, and(eq(stations.id, fieldReadings.stationId), eq(stations.organisationId, fieldReadings.organisationId)))
      .where(and(eq(fieldReadings.organisationId, organisationId), eq(fieldReadings.surveyId, surveyId), eq(fieldReadings.deleted, false)))
      .orderBy(asc(fieldReadings.measuredAt), asc(fieldReadings.id));
  }

  async function sweepRows(q: DbOrTx, organisationId: string, surveyId: string) {
    return q
      .select({
        sweep: sweeps,
        stationLabel: stations.label,
        levelId: stations.levelId,
        roomId: stations.roomId,
      })
      .from(sweeps)
      .innerJoin(stations, and(eq(stations.id, sweeps.stationId), eq(stations.organisationId, sweeps.organisationId)))
      .where(and(eq(sweeps.organisationId, organisationId), eq(sweeps.surveyId, surveyId), eq(sweeps.deleted, false)))
      .orderBy(asc(sweeps.measuredAt), asc(sweeps.id));
  }

  /**
   * Object keys of the survey's photos and traces that have reached the object store. A separate
   * query: as a correlated EXISTS per row it tripled the time of reading 100,000 readings.
   */
  async function arrivedKeys(q: DbOrTx, organisationId: string, surveyId: string): Promise<Set<string>> {
    const rows = await q
      .select({ key: attachments.objectKey })
      .from(attachments)
      .where(
        and(
          eq(attachments.organisationId, organisationId),
          sql`${attachments.recordId} IN (SELECT id FROM ${fieldReadings} WHERE survey_id = ${surveyId} UNION ALL SELECT id FROM ${sweeps} WHERE survey_id = ${surveyId})`,
        ),
      );
    return new Set(rows.map((r) => r.key));
  }

  async function site(q: DbOrTx, organisationId: string, siteId: string) {
    const [row] = await q
      .select({ id: sites.id, name: sites.name, address: sites.address })
      .from(sites)
      .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId)))
      .limit(1);
    return row ?? null;
  }

  async function zoneSet(q: DbOrTx, organisationId: string, zoneSetId: string | null) {
    if (!zoneSetId) return null;
    const [row] = await q
      .select({ id: zoneSets.id, name: zoneSets.name, edition: zoneSets.edition, thresholds: zoneSets.thresholds })
      .from(zoneSets)
      .where(and(eq(zoneSets.organisationId, organisationId), eq(zoneSets.id, zoneSetId)))
      .limit(1);
    return row ?? null;
  }

  async function usersById(q: DbOrTx, ids: string[]) {
    if (ids.length === 0) return [];
    return q.select({ userId: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids));
  }

  async function instrumentsById(q: DbOrTx, organisationId: string, ids: string[]) {
    if (ids.length === 0) return [];
    return q
      .select()
      .from(instruments)
      .where(and(eq(instruments.organisationId, organisationId), inArray(instruments.id, ids)));
  }

  async function levelsById(q: DbOrTx, organisationId: string, ids: string[]) {
    if (ids.length === 0) return [];
    return q
      .select({ id: levels.id, name: levels.name, ordinal: levels.ordinal })
      .from(levels)
      .where(and(eq(levels.organisationId, organisationId), inArray(levels.id, ids)))
      .orderBy(asc(levels.ordinal), asc(levels.name));
  }

  async function roomsById(q: DbOrTx, organisationId: string, ids: string[]) {
    if (ids.length === 0) return [];
    return q
      .select({ id: rooms.id, name: rooms.name, levelId: rooms.levelId })
      .from(rooms)
      .where(and(eq(rooms.organisationId, organisationId), inArray(rooms.id, ids)))
      .orderBy(asc(rooms.name));
  }

  /** Everything one survey's review or report needs, read in one snapshot. */
  async function surveyData(q: DbOrTx, organisationId: string, survey: SurveyRow) {
    // One connection (a transaction): the queries run one after another.
    const arrived = await arrivedKeys(q, organisationId, survey.id);
    const readings = (await readingRows(q, organisationId, survey.id)).map((r) => ({ ...r, attachmentArrived: r.reading.photoObjectKey !== null && arrived.has(r.reading.photoObjectKey) }));
    const sweepList = (await sweepRows(q, organisationId, survey.id)).map((r) => ({ ...r, attachmentArrived: r.sweep.traceObjectKey !== null && arrived.has(r.sweep.traceObjectKey) }));
    const decided = await liveDecisions(q, organisationId, survey.id);
    const conflicts = await openConflicts(q, organisationId, survey.id);
    const stationList = await q
      .select()
      .from(stations)
      .where(and(eq(stations.organisationId, organisationId), eq(stations.surveyId, survey.id), eq(stations.deleted, false)))
      .orderBy(asc(stations.createdAt), asc(stations.id));
    const flagList = await q
      .select()
      .from(flags)
      .where(and(eq(flags.organisationId, organisationId), eq(flags.surveyId, survey.id), eq(flags.deleted, false)))
      .orderBy(asc(flags.createdAt), asc(flags.id));
    const userIds = new Set<string>();
    readings.forEach((r) => userIds.add(r.reading.surveyorUserId));
    sweepList.forEach((s) => userIds.add(s.sweep.surveyorUserId));
    decided.forEach((d) => userIds.add(d.reviewerUserId));
    if (survey.submittedByUserId) userIds.add(survey.submittedByUserId);
    if (survey.signedOffByUserId) userIds.add(survey.signedOffByUserId);
    const instrumentIds = new Set<string>();
    readings.forEach((r) => r.reading.instrumentId && instrumentIds.add(r.reading.instrumentId));
    sweepList.forEach((s) => {
      if (s.sweep.analyserId) instrumentIds.add(s.sweep.analyserId);
      if (s.sweep.antennaId) instrumentIds.add(s.sweep.antennaId);
    });
    const levelIds = new Set([...survey.levelIds, ...stationList.map((s) => s.levelId)]);
    const roomIds = new Set(stationList.map((s) => s.roomId).filter((id): id is string => id !== null));
    const people = await usersById(q, [...userIds]);
    const instrumentList = await instrumentsById(q, organisationId, [...instrumentIds]);
    const levelList = await levelsById(q, organisationId, [...levelIds]);
    const roomList = await roomsById(q, organisationId, [...roomIds]);
    const siteRow = await site(q, organisationId, survey.siteId);
    const zone = await zoneSet(q, organisationId, survey.zoneSetId);
    return { readings, sweeps: sweepList, decisions: decided, conflicts, stations: stationList, flags: flagList, people, instruments: instrumentList, levels: levelList, rooms: roomList, site: siteRow, zoneSet: zone };
  }

  /** E-mail addresses of a survey's live team, by assignment role. */
  async function team(q: DbOrTx, organisationId: string, surveyId: string) {
    return q
      .select({ userId: users.id, name: users.name, email: users.email, as: surveyAssignments.role })
      .from(surveyAssignments)
      .innerJoin(users, eq(users.id, surveyAssignments.userId))
      .where(and(eq(surveyAssignments.organisationId, organisationId), eq(surveyAssignments.surveyId, surveyId), eq(surveyAssignments.deleted, false)));
  }

  return {
    findSurvey: (organisationId: string, surveyId: string) => findSurvey(db, organisationId, surveyId),
    /** Read in one REPEATABLE READ snapshot, so the report's parts agree with each other. */
    surveyData: (organisationId: string, survey: SurveyRow) =>
      db.transaction((tx) => surveyData(tx, organisationId, survey), { isolationLevel: 'repeatable read', accessMode: 'read only' }),
    team: (organisationId: string, surveyId: string) => team(db, organisationId, surveyId),
    usersById: (ids: string[]) => usersById(db, ids),

    /** Members of the organisation with one of `roles`. */
    async membersWithRoles(organisationId: string, roles: string[]) {
      return db
        .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.organisationId, organisationId), inArray(memberships.role, roles as never[])));
    },

    /** Members of the organisation by lower-cased e-mail. */
    async membersByEmail(organisationId: string) {
      return db
        .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(eq(memberships.organisationId, organisationId));
    },

    async gaussmeters(organisationId: string) {
      return db
        .select({ id: instruments.id, model: instruments.model, serial: instruments.serial, kind: instruments.kind })
        .from(instruments)
        .where(and(eq(instruments.organisationId, organisationId), eq(instruments.deleted, false)));
    },

    async siteLevelsAndRooms(organisationId: string, siteId: string) {
      const levelList = await db
        .select({ id: levels.id, name: levels.name })
        .from(levels)
        .where(and(eq(levels.organisationId, organisationId), eq(levels.siteId, siteId), eq(levels.deleted, false)));
      const roomList = levelList.length
        ? await db
            .select({ id: rooms.id, levelId: rooms.levelId, polygon: rooms.polygon })
            .from(rooms)
            .where(and(eq(rooms.organisationId, organisationId), inArray(rooms.levelId, levelList.map((l) => l.id)), eq(rooms.deleted, false)))
        : [];
      return { levels: levelList, rooms: roomList };
    },

    async surveyStationsAndReadings(organisationId: string, surveyId: string) {
      const stationList = await db
        .select()
        .from(stations)
        .where(and(eq(stations.organisationId, organisationId), eq(stations.surveyId, surveyId), eq(stations.deleted, false)));
      const readingList = await db
        .select({
          id: fieldReadings.id,
          stationId: fieldReadings.stationId,
          surveyorUserId: fieldReadings.surveyorUserId,
          measuredAt: fieldReadings.measuredAt,
          magnitudeT: fieldReadings.magnitudeT,
          bxT: fieldReadings.bxT,
          byT: fieldReadings.byT,
          bzT: fieldReadings.bzT,
        })
        .from(fieldReadings)
        .where(and(eq(fieldReadings.organisationId, organisationId), eq(fieldReadings.surveyId, surveyId), eq(fieldReadings.deleted, false)));
      return { stations: stationList, readings: readingList };
    },

    /** Runs `work` in a transaction with the survey row locked; null when there is no such survey. */
    async withLockedSurvey<T>(organisationId: string, surveyId: string, work: (tx: Tx, survey: SurveyRow) => Promise<T>): Promise<T | null> {
      return db.transaction(async (tx) => {
        const survey = await findSurvey(tx, organisationId, surveyId, true);
        if (!survey) return null;
        return work(tx, survey);
      });
    },

    /** The live decisions of the given readings/sweeps and which of the ids are readings or sweeps of the survey. */
    async targets(tx: Tx, organisationId: string, surveyId: string, ids: string[]) {
      const readingIds = await tx
          .select({ id: fieldReadings.id, surveyorUserId: fieldReadings.surveyorUserId, stationId: fieldReadings.stationId })
          .from(fieldReadings)
          .where(and(eq(fieldReadings.organisationId, organisationId), eq(fieldReadings.surveyId, surveyId), eq(fieldReadings.deleted, false), inArray(fieldReadings.id, ids)));
      const sweepIds = await tx
          .select({ id: sweeps.id, surveyorUserId: sweeps.surveyorUserId, stationId: sweeps.stationId })
          .from(sweeps)
          .where(and(eq(sweeps.organisationId, organisationId), eq(sweeps.surveyId, surveyId), eq(sweeps.deleted, false), inArray(sweeps.id, ids)));
      const live = await liveDecisions(tx, organisationId, surveyId);
      return { readings: readingIds, sweeps: sweepIds, live };
    },

    createDecision(tx: Tx, organisationId: string, values: Omit<typeof decisions.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision'>, ctx: AuditContext) {
      return createSynced(tx, decisions, 'decisions', organisationId, values, ctx);
    },

    updateDecision(tx: Tx, before: DecisionRow, patch: Partial<typeof decisions.$inferInsert>, ctx: AuditContext) {
      return updateSynced(tx, decisions, 'decisions', before, patch, ctx);
    },

    updateSurvey(tx: Tx, before: SurveyRow, patch: Partial<typeof surveys.$inferInsert>, ctx: AuditContext, action: string) {
      return updateSynced(tx, surveys, 'surveys', before, patch, ctx, { action });
    },

    audit(tx: Tx, input: Parameters<typeof recordAudit>[1]) {
      return recordAudit(tx, input);
    },

    openConflictCount: async (q: DbOrTx | null, organisationId: string, surveyId: string) => (await openConflicts(q ?? db, organisationId, surveyId)).length,
    surveyDataIn: (tx: Tx, organisationId: string, survey: SurveyRow) => surveyData(tx, organisationId, survey),

    /**
     * Creates imported stations and readings in one transaction: one reservation of change sequences,
     * multi-row inserts, and one audit row listing what was created (as a sync push does for creations).
     */
    async importRecords(organisationId: string, surveyId: string, newStations: StationInsert[], newReadings: FieldReadingInsert[], ctx: AuditContext, guard: (survey: SurveyRow) => void) {
      return db.transaction(async (tx) => {
        const survey = await findSurvey(tx, organisationId, surveyId, true);
        if (!survey) return null;
        guard(survey);
        const changes = [
          ...newStations.map((s) => ({ entity: 'stations' as const, entityId: s.id!, revision: 1, deleted: false })),
          ...newReadings.map((r) => ({ entity: 'field_readings' as const, entityId: r.id!, revision: 1, deleted: false })),
        ];
        if (changes.length === 0) return { stations: 0, readings: 0 };
        const seqs = await recordChanges(tx, organisationId, changes);
        const CHUNK = 1000;
        const stationValues = newStations.map((s, i) => ({ ...s, organisationId, surveyId, revision: 1, changeSeq: seqs[i]! }));
        for (let i = 0; i < stationValues.length; i += CHUNK) await tx.insert(stations).values(stationValues.slice(i, i + CHUNK));
        const readingValues = newReadings.map((r, i) => ({ ...r, organisationId, surveyId, revision: 1, changeSeq: seqs[newStations.length + i]! }));
        for (let i = 0; i < readingValues.length; i += CHUNK) await tx.insert(fieldReadings).values(readingValues.slice(i, i + CHUNK));
        await recordAudit(tx, {
          organisationId,
          actorUserId: ctx.actorUserId,
          action: 'import_readings',
          entity: 'surveys',
          entityId: surveyId,
          before: null,
          after: { stations: newStations.map((s) => s.id), fieldReadings: newReadings.map((r) => r.id) },
          requestId: ctx.requestId ?? null,
        });
        return { stations: newStations.length, readings: newReadings.length };
      });
    },
  };
}

export type ReviewRepository = ReturnType<typeof createReviewRepository>;

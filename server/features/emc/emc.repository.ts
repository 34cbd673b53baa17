import { and, eq, inArray, isNull, or, sql } from 'drizzle-orm';
import type { AuditContext } from '../../lib/audit-context';
import type { Db, Tx } from '../../db/client';
import { emitters, flags, memberships, rooms, surveys, users, watchBands } from '../../db/schema';
import { createSynced, updateSynced } from '../../db/synced-write';

export type FlagRow = typeof flags.$inferSelect;
export type FlagValues = Omit<typeof flags.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision'>;
export type SurveyRow = typeof surveys.$inferSelect;

export interface RoomFieldRow {
  roomId: string;
  fieldT: number;
  relativeUncertainty: number | null;
  /** The reading has an `accepted` latest decision. */
  accepted: boolean;
}

export function createEmcRepository(db: Db) {
  return {
    /**
     * Every live survey with the highest change sequence among what its flags depend on: its own row,
     * its stations, readings and decisions, the organisation's watch bands and instruments, and the
     * site's rooms and emitters. Any write to any of them raises it (tombstones too: they are writes).
     * With `onlySurveyId`, that survey's alone.
     */
    async dataVersions(onlySurveyId?: string): Promise<{ surveyId: string; organisationId: string; version: number }[]> {
      const result = await db.execute<{ survey_id: string; organisation_id: string; version: string }>(sql`
        SELECT s.id AS survey_id, s.organisation_id, greatest(
          s.change_seq,
          (SELECT max(change_seq) FROM stations WHERE survey_id = s.id),
          (SELECT max(change_seq) FROM field_readings WHERE survey_id = s.id),
          (SELECT max(change_seq) FROM decisions WHERE survey_id = s.id),
          (SELECT max(change_seq) FROM watch_bands WHERE organisation_id = s.organisation_id),
          (SELECT max(change_seq) FROM instruments WHERE organisation_id = s.organisation_id),
          (SELECT max(r.change_seq) FROM rooms r JOIN levels l ON l.id = r.level_id WHERE l.site_id = s.site_id),
          (SELECT max(e.change_seq) FROM emitters e JOIN rooms r ON r.id = e.room_id JOIN levels l ON l.id = r.level_id WHERE l.site_id = s.site_id)
        )::text AS version
        FROM surveys s WHERE NOT s.deleted${onlySurveyId ? sql` AND s.id = ${onlySurveyId}` : sql``}`);
      return result.rows.map((r) => ({ surveyId: r.survey_id, organisationId: r.organisation_id, version: Number(r.version) }));
    },

    async survey(organisationId: string, surveyId: string): Promise<SurveyRow | null> {
      const [row] = await db
        .select()
        .from(surveys)
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    /** The live rooms on the levels the survey walks. */
    async rooms(organisationId: string, levelIds: string[]) {
      if (levelIds.length === 0) return [];
      return db
        .select({ id: rooms.id, levelId: rooms.levelId, name: rooms.name, use: rooms.use, sensitivity: rooms.sensitivity })
        .from(rooms)
        .where(and(eq(rooms.organisationId, organisationId), inArray(rooms.levelId, levelIds), eq(rooms.deleted, false)));
    },

    /**
     * |B| of every live reading at a live station inside a room, with its gaussmeter's uncertainty and
     * whether its latest decision accepts it; readings whose latest decision rejects them are left out.
     */
    async roomFields(organisationId: string, surveyId: string): Promise<RoomFieldRow[]> {
      const result = await db.execute<{ room_id: string; field_t: number; relative_uncertainty: number | null; verdict: string | null }>(sql`
        SELECT st.room_id, fr.field_t, i.relative_uncertainty, latest.verdict
        FROM field_readings fr
        JOIN stations st ON st.id = fr.station_id AND NOT st.deleted AND st.room_id IS NOT NULL
        LEFT JOIN instruments i ON i.id = fr.instrument_id
        LEFT JOIN (
          SELECT DISTINCT ON (field_reading_id) field_reading_id, verdict FROM decisions
          WHERE organisation_id = ${organisationId} AND survey_id = ${surveyId} AND NOT deleted AND field_reading_id IS NOT NULL
          ORDER BY field_reading_id, change_seq DESC
        ) latest ON latest.field_reading_id = fr.id
        WHERE fr.organisation_id = ${organisationId} AND fr.survey_id = ${surveyId} AND NOT fr.deleted
          AND fr.field_t IS NOT NULL AND (latest.verdict IS NULL OR latest.verdict <> 'rejected')`);
      return result.rows.map((r) => ({ roomId: r.room_id, fieldT: Number(r.field_t), relativeUncertainty: r.relative_uncertainty === null ? null : Number(r.relative_uncertainty), accepted: r.verdict === 'accepted' }));
    },

    /** The organisation's bands and the site's own. */
    async watchBands(organisationId: string, siteId: string) {
      return db
        .select()
        .from(watchBands)
        .where(and(eq(watchBands.organisationId, organisationId), eq(watchBands.deleted, false), or(isNull(watchBands.siteId), eq(watchBands.siteId, siteId))));
    },

    async emitters(organisationId: string, roomIds: string[]) {
      if (roomIds.length === 0) return [];
      return db
        .select()
        .from(emitters)
        .where(and(eq(emitters.organisationId, organisationId), inArray(emitters.roomId, roomIds), eq(emitters.deleted, false)));
    },

    async flags(organisationId: string, surveyId: string, kind?: FlagRow['kind']): Promise<FlagRow[]> {
      return db
        .select()
        .from(flags)
        .where(and(eq(flags.organisationId, organisationId), eq(flags.surveyId, surveyId), eq(flags.deleted, false), kind ? eq(flags.kind, kind) : undefined));
    },

    async flag(organisationId: string, flagId: string): Promise<FlagRow | null> {
      const [row] = await db
        .select()
        .from(flags)
        .where(and(eq(flags.organisationId, organisationId), eq(flags.id, flagId), eq(flags.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    /**
     * Applies one recomputation in a transaction, holding the survey's row lock so two computations of
     * one survey (two server instances) take turns. `decide` sees the flags as they are inside the lock.
     */
    async applyFlags(
      organisationId: string,
      surveyId: string,
      decide: (current: FlagRow[]) => { creates: FlagValues[]; updates: { before: FlagRow; patch: Partial<FlagValues> }[]; withdraw: FlagRow[] },
      ctx: AuditContext,
    ): Promise<{ created: FlagRow[]; updated: number; withdrawn: number }> {
      return db.transaction(async (tx: Tx) => {
        // The state again, under the lock: sign-off hashes the report (flags included) holding this row,
        // so a sign-off that came in while the flags were computed wins and they stay as signed.
        const locked = await tx.execute<{ state: string }>(sql`SELECT state FROM surveys WHERE id = ${surveyId} FOR UPDATE`);
        if (locked.rows[0]?.state === 'signed_off') return { created: [], updated: 0, withdrawn: 0 };
        const current = await tx
          .select()
          .from(flags)
          .where(and(eq(flags.organisationId, organisationId), eq(flags.surveyId, surveyId), eq(flags.kind, 'line_in_band'), eq(flags.deleted, false)));
        const plan = decide(current);
        const created: FlagRow[] = [];
        for (const values of plan.creates) created.push(await createSynced(tx, flags, 'flags', organisationId, values, ctx));
        for (const { before, patch } of plan.updates) await updateSynced(tx, flags, 'flags', before, patch, ctx, { action: 'recompute' });
        for (const before of plan.withdraw) await updateSynced(tx, flags, 'flags', before, {}, ctx, { deleted: true, action: 'withdraw' });
        return { created, updated: plan.updates.length, withdrawn: plan.withdraw.length };
      });
    },

    async updateFlag(before: FlagRow, patch: Partial<FlagValues>, ctx: AuditContext, action: string): Promise<FlagRow> {
      return db.transaction((tx) => updateSynced(tx, flags, 'flags', before, patch, ctx, { action }));
    },

    /** The organisation's EMC engineers (who are told of new flags). */
    async emcTeam(organisationId: string) {
      return db
        .select({ id: users.id, name: users.name, email: users.email })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.organisationId, organisationId), eq(memberships.role, 'emc')));
    },

    async names(organisationId: string, siteId: string) {
      const result = await db.execute<{ name: string }>(sql`SELECT name FROM sites WHERE organisation_id = ${organisationId} AND id = ${siteId}`);
      return { siteName: result.rows[0]?.name ?? null };
    },
  };
}
export type EmcRepository = ReturnType<typeof createEmcRepository>;


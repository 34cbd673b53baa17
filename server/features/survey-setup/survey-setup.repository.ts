import { and, asc, count, desc, eq, inArray } from 'drizzle-orm';
import type { Role } from '../../../shared/schemas/common';
import type { SurveySettings, TeamMember } from '../../../shared/schemas/survey-setup';
import type { AuditContext } from '../../lib/audit-context';
import type { Db, DbOrTx } from '../../db/client';
import { levels, memberships, sites, stations, surveyAssignments, surveys, users, zoneSets } from '../../db/schema';
import { createSynced, tombstoneSynced, updateSynced } from '../../db/synced-write';

type SurveyRow = typeof surveys.$inferSelect;
export type SurveyValues = Omit<typeof surveys.$inferInsert, 'id' | 'organisationId' | 'changeSeq' | 'revision' | 'siteId'>;

export function createSurveySetupRepository(db: Db) {
  async function team(q: DbOrTx, organisationId: string, surveyId: string): Promise<SurveySettings['team']> {
    const rows = await q
      .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, as: surveyAssignments.role })
      .from(surveyAssignments)
      .innerJoin(users, eq(users.id, surveyAssignments.userId))
      .leftJoin(memberships, and(eq(memberships.userId, surveyAssignments.userId), eq(memberships.organisationId, surveyAssignments.organisationId)))
      .where(and(eq(surveyAssignments.organisationId, organisationId), eq(surveyAssignments.surveyId, surveyId), eq(surveyAssignments.deleted, false)))
      .orderBy(asc(users.name));
    const member = (r: (typeof rows)[number]): TeamMember => ({ userId: r.userId, name: r.name, email: r.email, role: (r.role ?? 'viewer') as Role });
    return { surveyors: rows.filter((r) => r.as === 'surveyor').map(member), reviewers: rows.filter((r) => r.as === 'reviewer').map(member) };
  }

  async function settings(q: DbOrTx, row: SurveyRow): Promise<SurveySettings> {
    return {
      id: row.id,
      siteId: row.siteId,
      name: row.name,
      state: row.state,
      zoneSetId: row.zoneSetId,
      levelIds: row.levelIds,
      species: row.species,
      maxHarmonic: row.maxHarmonic,
      repeatRadiusM: row.repeatRadiusM,
      startsOn: row.startsOn,
      endsOn: row.endsOn,
      notes: row.notes,
      revision: row.revision,
      changeSeq: row.changeSeq,
      team: await team(q, row.organisationId, row.id),
    };
  }

  async function findRow(q: DbOrTx, organisationId: string, surveyId: string, lock = false) {
    const base = q
      .select()
      .from(surveys)
      .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)))
      .limit(1);
    const [row] = lock ? await base.for('update') : await base;
    return row ?? null;
  }

  return {
    findRow: (organisationId: string, surveyId: string) => findRow(db, organisationId, surveyId),
    settings: (row: SurveyRow) => settings(db, row),

    async site(organisationId: string, siteId: string) {
      const [row] = await db
        .select({ id: sites.id, name: sites.name, archived: sites.archived })
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
        .limit(1);
      return row ?? null;
    },

    /** The site's live levels (archived ones included, flagged), bottom floor first. */
    async siteLevels(organisationId: string, siteId: string) {
      return db
        .select({ id: levels.id, name: levels.name, archived: levels.archived })
        .from(levels)
        .where(and(eq(levels.organisationId, organisationId), eq(levels.siteId, siteId), eq(levels.deleted, false)))
        .orderBy(asc(levels.ordinal), asc(levels.name));
    },

    /** How many live stations of the survey stand on each of `levelIds` (levels with none are left out). */
    async stationCounts(organisationId: string, surveyId: string, levelIds: string[]) {
      if (levelIds.length === 0) return [];
      return db
        .select({ levelId: stations.levelId, stations: count() })
        .from(stations)
        .where(and(eq(stations.organisationId, organisationId), eq(stations.surveyId, surveyId), inArray(stations.levelId, levelIds), eq(stations.deleted, false)))
        .groupBy(stations.levelId);
    },

    async zoneSets(organisationId: string) {
      return db
        .select({ id: zoneSets.id, name: zoneSets.name, edition: zoneSets.edition, isDefault: zoneSets.isDefault, thresholds: zoneSets.thresholds })
        .from(zoneSets)
        .where(and(eq(zoneSets.organisationId, organisationId), eq(zoneSets.deleted, false)))
        .orderBy(desc(zoneSets.isDefault), asc(zoneSets.name));
    },

    async members(organisationId: string, userIds: string[]) {
      if (userIds.length === 0) return [];
      return db
        .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.organisationId, organisationId), inArray(memberships.userId, userIds)));
    },

    async create(organisationId: string, siteId: string, values: SurveyValues, ctx: AuditContext): Promise<SurveySettings> {
      return db.transaction(async (tx) => settings(tx, await createSynced(tx, surveys, 'surveys', organisationId, { ...values, siteId }, ctx)));
    },

    /** 'not_open' when the survey has been submitted or signed off meanwhile. */
    async update(organisationId: string, surveyId: string, patch: Partial<SurveyValues>, ctx: AuditContext): Promise<SurveySettings | null | 'not_open'> {
      return db.transaction(async (tx) => {
        const before = await findRow(tx, organisationId, surveyId, true);
        if (!before) return null;
        if (before.state !== 'open') return 'not_open';
        return settings(tx, await updateSynced(tx, surveys, 'surveys', before, patch, ctx));
      });
    },

    /**
     * Makes the survey's live assignments exactly `wanted`: missing ones are created, extra ones
     * tombstoned, unchanged ones left alone. Returns the surveyors that were newly added.
     */
    async setTeam(
      organisationId: string,
      surveyId: string,
      wanted: { surveyors: string[]; reviewers: string[] },
      ctx: AuditContext,
    ): Promise<{ settings: SurveySettings; addedSurveyors: string[] } | null> {
      return db.transaction(async (tx) => {
        const survey = await findRow(tx, organisationId, surveyId, true);
        if (!survey) return null;
        const current = await tx
          .select()
          .from(surveyAssignments)
          .where(and(eq(surveyAssignments.organisationId, organisationId), eq(surveyAssignments.surveyId, surveyId), eq(surveyAssignments.deleted, false)));
        const addedSurveyors: string[] = [];
        for (const role of ['surveyor', 'reviewer'] as const) {
          const want = new Set(role === 'surveyor' ? wanted.surveyors : wanted.reviewers);
          const have = current.filter((a) => a.role === role);
          for (const a of have) if (!want.has(a.userId)) await tombstoneSynced(tx, surveyAssignments, 'survey_assignments', a, ctx);
          for (const userId of want) {
            if (have.some((a) => a.userId === userId)) continue;
            await createSynced(tx, surveyAssignments, 'survey_assignments', organisationId, { surveyId, userId, role }, ctx);
            if (role === 'surveyor') addedSurveyors.push(userId);
          }
        }
        return { settings: await settings(tx, survey), addedSurveyors };
      });
    },
  };
}
export type SurveySetupRepository = ReturnType<typeof createSurveySetupRepository>;

import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { SurveySummary } from '../../../shared/schemas/home';
import type { Db } from '../../db/client';
import { fieldReadings, sites, stations, surveyAssignments, surveys } from '../../db/schema';

export function createSurveysRepository(db: Db) {
  const summary = (userId: string) => ({
    id: surveys.id,
    siteId: surveys.siteId,
    siteName: sites.name,
    name: surveys.name,
    state: surveys.state,
    startsOn: surveys.startsOn,
    // Aliases spelled out: Drizzle leaves columns unqualified inside sql`` in a single-table select
    // (see sites.repository.ts), and these must not depend on the join below to stay correct.
    stationCount: sql<number>`(SELECT count(*)::int FROM ${stations} st WHERE st.survey_id = ${surveys}.id AND st.organisation_id = ${surveys}.organisation_id AND NOT st.deleted)`,
    readingCount: sql<number>`(SELECT count(*)::int FROM ${fieldReadings} fr WHERE fr.survey_id = ${surveys}.id AND fr.organisation_id = ${surveys}.organisation_id AND NOT fr.deleted)`,
    assignedToMe: sql<boolean>`EXISTS (SELECT 1 FROM ${surveyAssignments} sa WHERE sa.survey_id = ${surveys}.id AND sa.user_id = ${userId} AND NOT sa.deleted)`,
  });

  const base = (userId: string) =>
    db
      .select(summary(userId))
      .from(surveys)
      .innerJoin(sites, and(eq(sites.id, surveys.siteId), eq(sites.organisationId, surveys.organisationId)));

  return {
    async list(organisationId: string, userId: string): Promise<SurveySummary[]> {
      return base(userId)
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.deleted, false)))
        .orderBy(desc(surveys.startsOn), asc(surveys.name));
    },

    /** Scoped by organisation: another organisation's survey id finds nothing. */
    async find(organisationId: string, surveyId: string, userId: string): Promise<SurveySummary | null> {
      const [row] = await base(userId)
        .where(and(eq(surveys.organisationId, organisationId), eq(surveys.id, surveyId), eq(surveys.deleted, false)))
        .limit(1);
      return row ?? null;
    },
  };
}
export type SurveysRepository = ReturnType<typeof createSurveysRepository>;

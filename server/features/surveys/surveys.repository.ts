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
    stationCount: sql<number>`(SELECT count(*)::int FROM ${stations} WHERE ${stations.surveyId} = ${surveys.id} AND ${stations.organisationId} = ${surveys.organisationId} AND NOT ${stations.deleted})`,
    readingCount: sql<number>`(SELECT count(*)::int FROM ${fieldReadings} WHERE ${fieldReadings.surveyId} = ${surveys.id} AND ${fieldReadings.organisationId} = ${surveys.organisationId} AND NOT ${fieldReadings.deleted})`,
    assignedToMe: sql<boolean>`EXISTS (SELECT 1 FROM ${surveyAssignments} WHERE ${surveyAssignments.surveyId} = ${surveys.id} AND ${surveyAssignments.userId} = ${userId} AND NOT ${surveyAssignments.deleted})`,
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

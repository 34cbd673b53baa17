import { and, asc, eq, sql } from 'drizzle-orm';
import type { SiteSummary } from '../../../shared/schemas/home';
import type { Db } from '../../db/client';
import { levels, sites, sources } from '../../db/schema';

export function createSitesRepository(db: Db) {
  const summary = {
    id: sites.id,
    name: sites.name,
    address: sites.address,
    levelCount: sql<number>`(SELECT count(*)::int FROM ${levels} WHERE ${levels.siteId} = ${sites.id} AND ${levels.organisationId} = ${sites.organisationId} AND NOT ${levels.deleted})`,
    sourceCount: sql<number>`(SELECT count(*)::int FROM ${sources} WHERE ${sources.siteId} = ${sites.id} AND ${sources.organisationId} = ${sites.organisationId} AND NOT ${sources.deleted})`,
    archived: sites.archived,
  };

  return {
    async list(organisationId: string): Promise<SiteSummary[]> {
      return db
        .select(summary)
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.deleted, false)))
        .orderBy(asc(sites.archived), asc(sites.name));
    },

    /** Scoped by organisation: another organisation's site id finds nothing. */
    async find(organisationId: string, siteId: string): Promise<SiteSummary | null> {
      const [row] = await db
        .select(summary)
        .from(sites)
        .where(and(eq(sites.organisationId, organisationId), eq(sites.id, siteId), eq(sites.deleted, false)))
        .limit(1);
      return row ?? null;
    },
  };
}
export type SitesRepository = ReturnType<typeof createSitesRepository>;

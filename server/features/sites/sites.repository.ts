import { and, asc, eq, sql } from 'drizzle-orm';
import type { SiteSummary } from '../../../shared/schemas/home';
import type { Db } from '../../db/client';
import { levels, sites, sources } from '../../db/schema';

export function createSitesRepository(db: Db) {
  const summary = {
    id: sites.id,
    name: sites.name,
    address: sites.address,
    // Correlated subqueries spell out their aliases: Drizzle renders a column inside sql`` without its
    // table in a single-table select, so `${levels.siteId} = ${sites.id}` would compare levels with itself.
    levelCount: sql<number>`(SELECT count(*)::int FROM ${levels} l WHERE l.site_id = ${sites}.id AND l.organisation_id = ${sites}.organisation_id AND NOT l.deleted)`,
    sourceCount: sql<number>`(SELECT count(*)::int FROM ${sources} s WHERE s.site_id = ${sites}.id AND s.organisation_id = ${sites}.organisation_id AND NOT s.deleted)`,
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

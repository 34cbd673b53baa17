import type { SiteSummary } from '../../../shared/schemas/home';
import { notFound } from '../../lib/errors';
import type { SitesRepository } from './sites.repository';

export function createSitesService(repo: SitesRepository) {
  return {
    list: (organisationId: string): Promise<SiteSummary[]> => repo.list(organisationId),
    async get(organisationId: string, siteId: string): Promise<SiteSummary> {
      const site = await repo.find(organisationId, siteId);
      if (!site) throw notFound('That site');
      return site;
    },
  };
}
export type SitesService = ReturnType<typeof createSitesService>;

import type { AuditEntry } from '../../../shared/schemas/audit';
import type { SiteSummary } from '../../../shared/schemas/home';
import type { Level, LevelCreate, LevelUpdate, SiteCreate, SiteDetail, SiteUpdate } from '../../../shared/schemas/site';
import type { AuditContext } from '../../lib/audit-context';
import { notFound } from '../../lib/errors';
import type { SitesRepository } from './sites.repository';

export function createSitesService(repo: SitesRepository) {
  const found = <T>(value: T | null, what: string): T => {
    if (value === null) throw notFound(what);
    return value;
  };
  return {
    list: (organisationId: string): Promise<SiteSummary[]> => repo.list(organisationId),
    async get(organisationId: string, siteId: string): Promise<SiteDetail> {
      return found(await repo.detail(organisationId, siteId), 'That site');
    },
    create: (organisationId: string, input: SiteCreate, ctx: AuditContext): Promise<SiteDetail> => repo.create(organisationId, input, ctx),
    async update(organisationId: string, siteId: string, patch: SiteUpdate, ctx: AuditContext): Promise<SiteDetail> {
      return found(await repo.update(organisationId, siteId, patch, ctx), 'That site');
    },
    /** Sites are archived, never deleted: a site with surveys keeps its history (issue 6 §1). */
    async setArchived(organisationId: string, siteId: string, archived: boolean, ctx: AuditContext): Promise<SiteDetail> {
      return found(await repo.update(organisationId, siteId, { archived }, ctx, archived ? 'archive' : 'unarchive'), 'That site');
    },
    async levels(organisationId: string, siteId: string): Promise<Level[]> {
      found(await repo.find(organisationId, siteId), 'That site');
      return repo.listLevels(organisationId, siteId);
    },
    async createLevel(organisationId: string, siteId: string, input: LevelCreate, ctx: AuditContext): Promise<Level> {
      found(await repo.find(organisationId, siteId), 'That site');
      return repo.createLevel(organisationId, siteId, input, ctx);
    },
    async updateLevel(organisationId: string, levelId: string, patch: LevelUpdate, ctx: AuditContext): Promise<Level> {
      return found(await repo.updateLevel(organisationId, levelId, patch, ctx), 'That level');
    },
    async audit(organisationId: string, siteId: string, limit: number): Promise<AuditEntry[]> {
      found(await repo.find(organisationId, siteId), 'That site');
      return repo.audit(organisationId, siteId, limit);
    },
  };
}
export type SitesService = ReturnType<typeof createSitesService>;

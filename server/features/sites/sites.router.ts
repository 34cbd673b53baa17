import { Router } from 'express';
import { AuditQuerySchema } from '../../../shared/schemas/audit';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { SiteParamsSchema } from '../../../shared/schemas/home';
import { LevelCreateSchema, LevelParamsSchema, LevelUpdateSchema, SiteCreateSchema, SiteUpdateSchema } from '../../../shared/schemas/site';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { SitesService } from './sites.service';

const ListInput = { params: OrgParamsSchema };
const OneInput = { params: SiteParamsSchema };
const CreateInput = { params: OrgParamsSchema, body: SiteCreateSchema };
const UpdateInput = { params: SiteParamsSchema, body: SiteUpdateSchema };
const LevelCreateInput = { params: SiteParamsSchema, body: LevelCreateSchema };
const LevelUpdateInput = { params: LevelParamsSchema, body: LevelUpdateSchema };
const AuditInput = { params: SiteParamsSchema, query: AuditQuerySchema };

/** Who may describe sites (issue 6): admins and reviewers. */
export const SITE_WRITERS = ['admin', 'reviewer'] as const;

/** Mounted at /api. */
export default function sitesRouter(deps: { sites: SitesService; guards: AuthGuards }): Router {
  const { sites, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(SITE_WRITERS)];

  router.get('/orgs/:orgId/sites', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ sites: await sites.list(params.orgId) });
  });

  router.post('/orgs/:orgId/sites', ...write, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await sites.create(params.orgId, body, auditContextOf(req)));
  });

  router.get('/orgs/:orgId/sites/:siteId', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await sites.get(params.orgId, params.siteId));
  });

  router.patch('/orgs/:orgId/sites/:siteId', ...write, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await sites.update(params.orgId, params.siteId, body, auditContextOf(req)));
  });

  router.post('/orgs/:orgId/sites/:siteId/archive', ...write, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await sites.setArchived(params.orgId, params.siteId, true, auditContextOf(req)));
  });

  router.post('/orgs/:orgId/sites/:siteId/unarchive', ...write, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await sites.setArchived(params.orgId, params.siteId, false, auditContextOf(req)));
  });

  router.get('/orgs/:orgId/sites/:siteId/levels', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json({ levels: await sites.levels(params.orgId, params.siteId) });
  });

  router.post('/orgs/:orgId/sites/:siteId/levels', ...write, validate(LevelCreateInput), async (req, res) => {
    const { params, body } = validated(req, LevelCreateInput);
    res.status(201).json(await sites.createLevel(params.orgId, params.siteId, body, auditContextOf(req)));
  });

  router.patch('/orgs/:orgId/levels/:levelId', ...write, validate(LevelUpdateInput), async (req, res) => {
    const { params, body } = validated(req, LevelUpdateInput);
    res.json(await sites.updateLevel(params.orgId, params.levelId, body, auditContextOf(req)));
  });

  router.get('/orgs/:orgId/sites/:siteId/audit', guards.requireUser, guards.requireMember(['admin']), validate(AuditInput), async (req, res) => {
    const { params, query } = validated(req, AuditInput);
    res.json({ entries: await sites.audit(params.orgId, params.siteId, query.limit) });
  });

  return router;
}

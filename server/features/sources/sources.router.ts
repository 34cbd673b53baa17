import { Router } from 'express';
import { SiteParamsSchema } from '../../../shared/schemas/home';
import { SourceCreateSchema, SourceParamsSchema, SourceUpdateSchema } from '../../../shared/schemas/source';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { SourcesService } from './sources.service';

const ListInput = { params: SiteParamsSchema };
const CreateInput = { params: SiteParamsSchema, body: SourceCreateSchema };
const UpdateInput = { params: SourceParamsSchema, body: SourceUpdateSchema };
const OneInput = { params: SourceParamsSchema };

/** Mounted at /api. */
export default function sourcesRouter(deps: { sources: SourcesService; guards: AuthGuards }): Router {
  const { sources, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(['admin', 'reviewer'])];

  router.get('/orgs/:orgId/sites/:siteId/sources', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ sources: await sources.list(params.orgId, params.siteId) });
  });
  router.post('/orgs/:orgId/sites/:siteId/sources', ...write, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await sources.create(params.orgId, params.siteId, body, auditContextOf(req)));
  });
  router.patch('/orgs/:orgId/sources/:sourceId', ...write, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await sources.update(params.orgId, params.sourceId, body, auditContextOf(req)));
  });
  router.delete('/orgs/:orgId/sources/:sourceId', ...write, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    await sources.remove(params.orgId, params.sourceId, auditContextOf(req));
    res.status(204).end();
  });
  return router;
}

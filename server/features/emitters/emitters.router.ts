import { Router } from 'express';
import { EmitterCreateSchema, EmitterParamsSchema, EmitterQuerySchema, EmitterUpdateSchema } from '../../../shared/schemas/emitter';
import { SiteParamsSchema } from '../../../shared/schemas/home';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { EmittersService } from './emitters.service';

const ListInput = { params: SiteParamsSchema, query: EmitterQuerySchema };
const CreateInput = { params: SiteParamsSchema, body: EmitterCreateSchema };
const UpdateInput = { params: EmitterParamsSchema, body: EmitterUpdateSchema };
const OneInput = { params: EmitterParamsSchema };

/** Mounted at /api. */
export default function emittersRouter(deps: { emitters: EmittersService; guards: AuthGuards }): Router {
  const { emitters, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(['admin', 'reviewer'])];

  router.get('/orgs/:orgId/sites/:siteId/emitters', ...read, validate(ListInput), async (req, res) => {
    const { params, query } = validated(req, ListInput);
    res.json({ emitters: await emitters.list(params.orgId, params.siteId, query.fieldT) });
  });
  router.post('/orgs/:orgId/sites/:siteId/emitters', ...write, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await emitters.create(params.orgId, params.siteId, body, auditContextOf(req)));
  });
  router.patch('/orgs/:orgId/emitters/:emitterId', ...write, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await emitters.update(params.orgId, params.emitterId, body, auditContextOf(req)));
  });
  router.delete('/orgs/:orgId/emitters/:emitterId', ...write, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    await emitters.remove(params.orgId, params.emitterId, auditContextOf(req));
    res.status(204).end();
  });
  return router;
}

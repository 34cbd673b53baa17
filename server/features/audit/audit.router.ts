import { Router } from 'express';
import { AuditQuerySchema } from '../../../shared/schemas/audit';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import type { AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { AuditService } from './audit.service';

const ListInput = { params: OrgParamsSchema, query: AuditQuerySchema };

/** Mounted at /api. */
export default function auditRouter(deps: { audit: AuditService; guards: AuthGuards }): Router {
  const { audit, guards } = deps;
  const router = Router();

  router.get('/orgs/:orgId/audit', guards.requireUser, guards.requireMember(['admin']), validate(ListInput), async (req, res) => {
    const { params, query } = validated(req, ListInput);
    res.json({ entries: await audit.recent(params.orgId, query.limit) });
  });

  return router;
}

import { Router } from 'express';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { SiteParamsSchema } from '../../../shared/schemas/home';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { SitesService } from './sites.service';

const ListInput = { params: OrgParamsSchema };
const OneInput = { params: SiteParamsSchema };

/** Mounted at /api. */
export default function sitesRouter(deps: { sites: SitesService; guards: AuthGuards }): Router {
  const { sites, guards } = deps;
  const router = Router();

  router.get('/orgs/:orgId/sites', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ sites: await sites.list(params.orgId) });
  });

  router.get('/orgs/:orgId/sites/:siteId', guards.requireUser, guards.requireMember(EVERY_ROLE), validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await sites.get(params.orgId, params.siteId));
  });

  return router;
}

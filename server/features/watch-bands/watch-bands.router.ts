import { Router } from 'express';
import { z } from 'zod';
import { OrgParamsSchema, UuidSchema } from '../../../shared/schemas/common';
import { SiteParamsSchema } from '../../../shared/schemas/home';
import { WatchBandCreateSchema, WatchBandImportSchema, WatchBandParamsSchema, WatchBandUpdateSchema } from '../../../shared/schemas/watch-band';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { WatchBandsService } from './watch-bands.service';

const ListInput = { params: OrgParamsSchema };
const CreateInput = { params: OrgParamsSchema, body: WatchBandCreateSchema };
const UpdateInput = { params: WatchBandParamsSchema, body: WatchBandUpdateSchema };
const OneInput = { params: WatchBandParamsSchema };
const ImportInput = { params: OrgParamsSchema, body: WatchBandImportSchema };
const SiteInput = { params: SiteParamsSchema };
const MriInput = { params: z.object({ orgId: UuidSchema, siteId: UuidSchema, sourceId: UuidSchema }) };

/** Mounted at /api. Every member reads the bands; EMC engineers and admins keep them (DESIGN.md §1). */
export default function watchBandsRouter(deps: { watchBands: WatchBandsService; guards: AuthGuards }): Router {
  const { watchBands, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(['emc', 'admin'])];

  router.get('/orgs/:orgId/watch-bands', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ watchBands: await watchBands.list(params.orgId) });
  });
  router.post('/orgs/:orgId/watch-bands', ...write, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await watchBands.create(params.orgId, body, auditContextOf(req)));
  });
  router.get('/orgs/:orgId/watch-bands/export.csv', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.set('Content-Type', 'text/csv; charset=utf-8; header=present');
    res.set('Content-Disposition', 'attachment; filename="watch-bands.csv"');
    res.send(await watchBands.exportCsv(params.orgId));
  });
  router.post('/orgs/:orgId/watch-bands/import', ...write, validate(ImportInput), async (req, res) => {
    const { params, body } = validated(req, ImportInput);
    res.json(await watchBands.importCsv(params.orgId, body, auditContextOf(req)));
  });
  router.post('/orgs/:orgId/watch-bands/starter-set', ...write, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json(await watchBands.addStarterSet(params.orgId, auditContextOf(req)));
  });
  router.patch('/orgs/:orgId/watch-bands/:watchBandId', ...write, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await watchBands.update(params.orgId, params.watchBandId, body, auditContextOf(req)));
  });
  router.delete('/orgs/:orgId/watch-bands/:watchBandId', ...write, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    await watchBands.remove(params.orgId, params.watchBandId, auditContextOf(req));
    res.status(204).end();
  });
  router.get('/orgs/:orgId/sites/:siteId/mri-bands', ...read, validate(SiteInput), async (req, res) => {
    const { params } = validated(req, SiteInput);
    res.json({ suggestions: await watchBands.mriSuggestions(params.orgId, params.siteId) });
  });
  router.post('/orgs/:orgId/sites/:siteId/mri-bands/:sourceId', ...write, validate(MriInput), async (req, res) => {
    const { params } = validated(req, MriInput);
    res.status(201).json(await watchBands.addMriBand(params.orgId, params.siteId, params.sourceId, auditContextOf(req)));
  });
  return router;
}

import { Router } from 'express';
import { OrgParamsSchema } from '../../../shared/schemas/common';
import { ANTENNA_FACTOR_MAX_BYTES, InstrumentCreateSchema, InstrumentParamsSchema, InstrumentUpdateSchema } from '../../../shared/schemas/instrument';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { singleFileUpload } from '../../middleware/upload';
import { validate, validated } from '../../middleware/validate';
import type { InstrumentsService } from './instruments.service';

const ListInput = { params: OrgParamsSchema };
const CreateInput = { params: OrgParamsSchema, body: InstrumentCreateSchema };
const OneInput = { params: InstrumentParamsSchema };
const UpdateInput = { params: InstrumentParamsSchema, body: InstrumentUpdateSchema };

/** Mounted at /api. Instruments are the admins' (DESIGN.md §1); EMC engineers also keep antenna tables. */
export default function instrumentsRouter(deps: { instruments: InstrumentsService; guards: AuthGuards }): Router {
  const { instruments, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const admin = [guards.requireUser, guards.requireMember(['admin'])];

  router.get('/orgs/:orgId/instruments', ...read, validate(ListInput), async (req, res) => {
    const { params } = validated(req, ListInput);
    res.json({ instruments: await instruments.list(params.orgId) });
  });
  router.post('/orgs/:orgId/instruments', ...admin, validate(CreateInput), async (req, res) => {
    const { params, body } = validated(req, CreateInput);
    res.status(201).json(await instruments.create(params.orgId, body, auditContextOf(req)));
  });
  router.get('/orgs/:orgId/instruments/:instrumentId', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await instruments.get(params.orgId, params.instrumentId));
  });
  router.patch('/orgs/:orgId/instruments/:instrumentId', ...admin, validate(UpdateInput), async (req, res) => {
    const { params, body } = validated(req, UpdateInput);
    res.json(await instruments.update(params.orgId, params.instrumentId, body, auditContextOf(req)));
  });
  router.put(
    '/orgs/:orgId/instruments/:instrumentId/antenna-factors',
    guards.requireUser,
    guards.requireMember(['admin', 'emc']),
    validate(OneInput),
    singleFileUpload('file', ANTENNA_FACTOR_MAX_BYTES),
    async (req, res) => {
      const { params } = validated(req, OneInput);
      res.json(await instruments.setAntennaFactors(params.orgId, params.instrumentId, req.file!.buffer, auditContextOf(req)));
    },
  );
  router.get('/orgs/:orgId/instruments/:instrumentId/antenna-factors', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await instruments.antennaFactors(params.orgId, params.instrumentId));
  });
  return router;
}

import { Router } from 'express';
import { CalibrationInputSchema, PLAN_UPLOAD_MAX_BYTES, PlanImageQuerySchema, PlanParamsSchema } from '../../../shared/schemas/plan';
import { LevelParamsSchema } from '../../../shared/schemas/site';
import { auditContextOf } from '../../lib/audit-context';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { singleFileUpload } from '../../middleware/upload';
import { validate, validated } from '../../middleware/validate';
import type { PlansService } from './plans.service';

const UploadInput = { params: LevelParamsSchema };
const OneInput = { params: PlanParamsSchema };
const ImageInput = { params: PlanParamsSchema, query: PlanImageQuerySchema };
const CalibrateInput = { params: PlanParamsSchema, body: CalibrationInputSchema };

/** A plan id never changes its image (a new upload is a new plan), so browsers may keep it a day. */
const IMAGE_CACHE_SECONDS = 86_400;

/** Mounted at /api. */
export default function plansRouter(deps: { plans: PlansService; guards: AuthGuards }): Router {
  const { plans, guards } = deps;
  const router = Router();
  const read = [guards.requireUser, guards.requireMember(EVERY_ROLE)];
  const write = [guards.requireUser, guards.requireMember(['admin', 'reviewer'])];

  router.post('/orgs/:orgId/levels/:levelId/plans', ...write, validate(UploadInput), singleFileUpload('file', PLAN_UPLOAD_MAX_BYTES), async (req, res) => {
    const { params } = validated(req, UploadInput);
    res.status(201).json(await plans.upload(params.orgId, params.levelId, req.file!, auditContextOf(req)));
  });

  router.get('/orgs/:orgId/plans/:planId', ...read, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await plans.get(params.orgId, params.planId));
  });

  router.get('/orgs/:orgId/plans/:planId/image', ...read, validate(ImageInput), async (req, res) => {
    const { params, query } = validated(req, ImageInput);
    const { object, mime, etag } = await plans.image(params.orgId, params.planId, query.variant);
    res.setHeader('ETag', etag);
    res.setHeader('Cache-Control', `private, max-age=${IMAGE_CACHE_SECONDS}`);
    if (req.headers['if-none-match'] === etag) {
      object.body.destroy();
      res.status(304).end();
      return;
    }
    res.setHeader('Content-Type', mime);
    if (object.contentLength !== undefined) res.setHeader('Content-Length', String(object.contentLength));
    // An SVG opened on its own must not run anything, even if a hazard slipped past the upload check.
    if (mime === 'image/svg+xml') res.setHeader('Content-Security-Policy', "default-src 'none'; style-src 'unsafe-inline'; sandbox");
    await new Promise<void>((resolve, reject) => {
      object.body.once('error', reject);
      res.once('close', resolve);
      object.body.pipe(res);
    });
  });

  router.put('/orgs/:orgId/plans/:planId/calibration', ...write, validate(CalibrateInput), async (req, res) => {
    const { params, body } = validated(req, CalibrateInput);
    res.json(await plans.calibrate(params.orgId, params.planId, body, auditContextOf(req)));
  });

  return router;
}

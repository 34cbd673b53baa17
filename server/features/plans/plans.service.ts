/**
 * Plans: upload (content-checked, stored in the object store, metadata in PostgreSQL), the image
 * bytes, and calibration.
 *
 * Re-calibration policy, "keep pixels": stations, room outlines, sources and emitters are stored in
 * metres, but they were placed on the drawing. When a plan that already had a calibration is calibrated
 * again, each of them keeps its pixel position and gets the metres the new calibration gives that pixel
 * (shared/plans/calibration.ts reprojectPoint) — the drawing, not the earlier scale, is where people
 * stood, so a corrected scale corrects their metres. Stations of submitted or signed-off surveys keep
 * their metres (their report is fixed) and are counted in the answer. A first calibration moves nothing.
 * Every moved record gets a new revision, change_seq and audit row ('reproject').
 */
import { v7 as uuidv7 } from 'uuid';
import { CalibrationError, metresPerPixel, normaliseAngleDeg, type PlanCalibration } from '../../../shared/plans/calibration';
import type { CalibrationInput, CalibrationResult, Plan } from '../../../shared/schemas/plan';
import type { AuditContext } from '../../lib/audit-context';
import { planView } from '../../db/plan-view';
import { AppError, notFound } from '../../lib/errors';
import type { Logger } from '../../lib/logger';
import { inspectPlanFile } from '../../lib/plan-image';
import type { Storage, StoredObject } from '../../lib/storage';
import type { PlansRepository } from './plans.repository';

export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
  size: number;
}

const REPROJECTION_NOTE =
  'Everything placed on this plan kept its position on the drawing: stations of open surveys, room outlines, magnets and emitters ' +
  'were given the metres the new calibration assigns to their pixels. Stations of submitted or signed-off surveys keep their metres.';
const FIRST_CALIBRATION_NOTE = 'First calibration of this plan: nothing was moved.';

export function createPlansService(deps: { repo: PlansRepository; storage: Storage; logger: Logger }) {
  const { repo, storage, logger } = deps;

  return {
    async upload(organisationId: string, levelId: string, file: UploadedFile, ctx: AuditContext): Promise<Plan> {
      if (!(await repo.findLevel(organisationId, levelId))) throw notFound('That level');
      const inspected = await inspectPlanFile(file.buffer);
      const planId = uuidv7();
      const prefix = `orgs/${organisationId}/plans/${planId}`;
      const objectKey = `${prefix}/original.${inspected.extension}`;
      const deviceObjectKey = inspected.device ? `${prefix}/device.webp` : null;
      const written: string[] = [];
      try {
        await storage.putObject(objectKey, file.buffer, inspected.mime);
        written.push(objectKey);
        if (inspected.device && deviceObjectKey) {
          await storage.putObject(deviceObjectKey, inspected.device.bytes, inspected.device.mime);
          written.push(deviceObjectKey);
        }
        const stored = await repo.insertPlan(
          organisationId,
          levelId,
          {
            id: planId,
            objectKey,
            deviceObjectKey,
            originalName: file.originalname ? file.originalname.slice(0, 255) : null,
            mime: inspected.mime,
            byteSize: file.size,
            sha256: inspected.sha256,
            widthPx: inspected.widthPx,
            heightPx: inspected.heightPx,
          },
          ctx,
        );
        if (!stored) throw notFound('That level');
        return planView(stored.plan, stored.siteId);
      } catch (error) {
        // Nothing half-stored: the objects go if the row did not land.
        for (const key of written) {
          await storage.deleteObject(key).catch((e: unknown) => logger.warn({ err: e, key }, 'could not remove an orphaned plan object'));
        }
        throw error;
      }
    },

    async get(organisationId: string, planId: string): Promise<Plan> {
      const found = await repo.findPlan(organisationId, planId);
      if (!found) throw notFound('That plan');
      return planView(found.plan, found.siteId);
    },

    async image(organisationId: string, planId: string, variant: 'device' | 'original'): Promise<{ object: StoredObject; mime: string; etag: string }> {
      const found = await repo.findPlan(organisationId, planId);
      if (!found) throw notFound('That plan');
      const useDevice = variant === 'device' && found.plan.deviceObjectKey !== null;
      const key = useDevice ? found.plan.deviceObjectKey! : found.plan.objectKey;
      const object = await storage.getObject(key);
      if (!object) {
        logger.error({ planId, key }, 'plan image missing from the object store');
        throw new AppError('NOT_FOUND', 'The image of this plan is missing from the file store. Upload the plan again.');
      }
      const etag = `"${found.plan.sha256 ?? found.plan.id}${useDevice ? '-device' : ''}"`;
      return { object, mime: useDevice ? 'image/webp' : found.plan.mime, etag };
    },

    async calibrate(organisationId: string, planId: string, input: CalibrationInput, ctx: AuditContext): Promise<CalibrationResult> {
      let calibration: PlanCalibration;
      try {
        calibration = {
          metresPerPixel: metresPerPixel(input.pointA, input.pointB, input.distanceM),
          originXPx: input.origin.xPx,
          originYPx: input.origin.yPx,
          northAngleDeg: normaliseAngleDeg(input.northAngleDeg),
        };
      } catch (error) {
        if (error instanceof CalibrationError) {
          throw new AppError('VALIDATION_FAILED', error.message, { issues: [{ in: 'body', path: 'pointB', message: error.message }] });
        }
        throw error;
      }
      const result = await repo.calibrate(organisationId, planId, calibration, ctx);
      if (!result) throw notFound('That plan');
      return {
        plan: planView(result.plan, result.siteId),
        reprojection: { policy: 'keep_pixels', ...result.counts, note: result.hadCalibration ? REPROJECTION_NOTE : FIRST_CALIBRATION_NOTE },
      };
    },
  };
}
export type PlansService = ReturnType<typeof createPlansService>;

/** A plans row as the API shows it (PlanSchema): shared by the sites and plans repositories. */
import type { Plan } from '../../shared/schemas/plan';
import { PLAN_DEVICE_MAX_SIDE_PX } from '../../shared/schemas/plan';
import type { plans } from './schema';

type PlanRow = typeof plans.$inferSelect;

/** Size of the device copy made by the upload: the original scaled so its long side is PLAN_DEVICE_MAX_SIDE_PX. */
export function deviceSize(widthPx: number, heightPx: number): { widthPx: number; heightPx: number } {
  const scale = PLAN_DEVICE_MAX_SIDE_PX / Math.max(widthPx, heightPx);
  return { widthPx: Math.max(1, Math.round(widthPx * scale)), heightPx: Math.max(1, Math.round(heightPx * scale)) };
}

export function planView(row: PlanRow, siteId: string): Plan {
  const calibrated = row.metresPerPixel !== null && row.originXPx !== null && row.originYPx !== null;
  return {
    id: row.id,
    levelId: row.levelId,
    siteId,
    mime: row.mime as Plan['mime'],
    originalName: row.originalName,
    byteSize: row.byteSize,
    sha256: row.sha256,
    widthPx: row.widthPx,
    heightPx: row.heightPx,
    device: row.deviceObjectKey ? { mime: 'image/webp', ...deviceSize(row.widthPx, row.heightPx) } : null,
    calibration: calibrated
      ? { metresPerPixel: row.metresPerPixel!, originXPx: row.originXPx!, originYPx: row.originYPx!, northAngleDeg: row.northAngleDeg ?? 0 }
      : null,
    revision: row.revision,
    changeSeq: row.changeSeq,
    createdAt: row.createdAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

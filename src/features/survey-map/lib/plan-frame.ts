/**
 * The map's coordinate frame: Leaflet's CRS.Simple with one map unit = one plan metre (lat = y_m,
 * lng = x_m), so stations, rooms and contours from the server (all in plan metres) need no conversion.
 * Calibration (server/db/schema/sites.ts): x_m = (x_px − origin_x)·mpp, y_m = (origin_y − y_px)·mpp,
 * image rows growing downwards, so the image spans x from −origin_x·mpp to (width − origin_x)·mpp and
 * y from (origin_y − height)·mpp to origin_y·mpp.
 */
import type { MapPlan } from '@shared/schemas/survey-map';

/** [[south, west], [north, east]] in plan metres. */
export type MetreBounds = [[number, number], [number, number]];

/** The plan image's bounds in plan metres; an uncalibrated plan is drawn one metre per pixel (and said so). */
export function planBoundsM(plan: Pick<MapPlan, 'widthPx' | 'heightPx' | 'metresPerPixel' | 'originXPx' | 'originYPx'>): { bounds: MetreBounds; calibrated: boolean } {
  const calibrated = plan.metresPerPixel !== null && plan.metresPerPixel > 0;
  const mpp = calibrated ? (plan.metresPerPixel as number) : 1;
  const ox = plan.originXPx ?? 0;
  const oy = plan.originYPx ?? plan.heightPx;
  return {
    bounds: [
      [(oy - plan.heightPx) * mpp, -ox * mpp],
      [oy * mpp, (plan.widthPx - ox) * mpp],
    ],
    calibrated,
  };
}

/** Bounds of a set of [x, y] points in plan metres, padded; null for none. */
export function pointsBoundsM(points: Iterable<readonly [number, number]>, padM = 1): MetreBounds | null {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const [x, y] of points) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  if (!Number.isFinite(minX)) return null;
  return [
    [minY - padM, minX - padM],
    [maxY + padM, maxX + padM],
  ];
}

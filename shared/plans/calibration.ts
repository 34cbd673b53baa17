/**
 * Plan calibration: from two clicked pixels and the distance between them to a scale, and the transforms
 * between image pixels and the level's plan frame in metres.
 *
 * Frames (the same as server/db/schema/sites.ts):
 * - image pixels: (xPx, yPx) = (column, row), origin at the top-left corner, yPx grows DOWNWARDS;
 * - plan metres: (xM, yM) with the origin at the calibration's origin pixel, xM to the right of the image
 *   and yM UP the image (so a larger yM is nearer the top of the drawing):
 *     xM = (xPx − originXPx) · s,   yM = (originYPx − yPx) · s,   s = metres per pixel.
 * The north angle does not rotate the plan frame; it says where true north lies (degrees clockwise from
 * the image's "up"), for the compass and for east/north figures (`planToNorthEast`).
 */

export interface PixelPoint {
  xPx: number;
  yPx: number;
}

export interface PlanPointM {
  xM: number;
  yM: number;
}

export interface PlanCalibration {
  metresPerPixel: number;
  originXPx: number;
  originYPx: number;
  /** Direction of true north, degrees clockwise from the image's "up", [0, 360). */
  northAngleDeg: number;
}

/** Two calibration points closer than this (pixels) give no usable scale. */
export const MIN_CALIBRATION_SPAN_PX = 1;

export class CalibrationError extends Error {
  override name = 'CalibrationError';
}

function requireFinite(value: number, name: string): void {
  if (!Number.isFinite(value)) throw new CalibrationError(`${name} must be a finite number.`);
}

/** Scale from two pixels and the real distance between them: s = distanceM / |B − A| (m/px). */
export function metresPerPixel(pointA: PixelPoint, pointB: PixelPoint, distanceM: number): number {
  for (const [name, v] of [['pointA.xPx', pointA.xPx], ['pointA.yPx', pointA.yPx], ['pointB.xPx', pointB.xPx], ['pointB.yPx', pointB.yPx], ['distanceM', distanceM]] as const) {
    requireFinite(v, name);
  }
  if (distanceM <= 0) throw new CalibrationError('The distance between the two points must be greater than zero.');
  const spanPx = Math.hypot(pointB.xPx - pointA.xPx, pointB.yPx - pointA.yPx);
  if (spanPx < MIN_CALIBRATION_SPAN_PX) {
    throw new CalibrationError(`The two points must be at least ${MIN_CALIBRATION_SPAN_PX} px apart; pick two points far apart on the plan.`);
  }
  return distanceM / spanPx;
}

/** Normalises an angle in degrees into [0, 360). */
export function normaliseAngleDeg(angleDeg: number): number {
  requireFinite(angleDeg, 'angleDeg');
  const a = angleDeg % 360;
  const n = a < 0 ? a + 360 : a;
  // -0 and values that round to 360 land on 0.
  return n === 0 || n >= 360 ? 0 : n;
}

/** Image pixel → plan metres (y up the image). */
export function pixelToPlanM(point: PixelPoint, calibration: PlanCalibration): PlanPointM {
  const s = calibration.metresPerPixel;
  return { xM: (point.xPx - calibration.originXPx) * s, yM: (calibration.originYPx - point.yPx) * s };
}

/** Plan metres → image pixel; the inverse of {@link pixelToPlanM}. */
export function planMToPixel(point: PlanPointM, calibration: PlanCalibration): PixelPoint {
  const s = calibration.metresPerPixel;
  return { xPx: calibration.originXPx + point.xM / s, yPx: calibration.originYPx - point.yM / s };
}

/**
 * Plan metres → metres east and north of the origin, from the north angle θ (clockwise from image up):
 * north is the unit vector (sin θ, cos θ) in the plan frame, east is (cos θ, −sin θ).
 */
export function planToNorthEast(point: PlanPointM, northAngleDeg: number): { eastM: number; northM: number } {
  const t = (northAngleDeg * Math.PI) / 180;
  return {
    eastM: point.xM * Math.cos(t) - point.yM * Math.sin(t),
    northM: point.xM * Math.sin(t) + point.yM * Math.cos(t),
  };
}

/**
 * Re-calibration policy "keep pixels": a point placed on the drawing under the old calibration keeps its
 * pixel and gets the metres the new calibration gives that pixel.
 */
export function reprojectPoint(point: PlanPointM, from: PlanCalibration, to: PlanCalibration): PlanPointM {
  return pixelToPlanM(planMToPixel(point, from), to);
}

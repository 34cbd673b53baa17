/**
 * The plan view's coordinate frame: Leaflet's CRS.Simple with one map unit = one metre of the plan
 * frame (lat = y_m, lng = x_m), so stations, rooms and taps are all in plan metres with no conversion.
 *
 * Plan calibration (server/db/schema/sites.ts): x_m = (x_px − origin_x)·mpp, y_m = (origin_y − y_px)·mpp,
 * image rows growing downwards. The image's corners therefore sit at
 *   x from −origin_x·mpp to (width − origin_x)·mpp,   y from (origin_y − height)·mpp to origin_y·mpp.
 */

export interface PlanCalibrationInput {
  widthPx: number;
  heightPx: number;
  metresPerPixel: number | null;
  originXPx: number | null;
  originYPx: number | null;
}

/** [[south, west], [north, east]] = [[yMin, xMin], [yMax, xMax]] in plan metres. */
export type MetreBounds = [[number, number], [number, number]];

/**
 * Bounds of the plan image in plan metres. An uncalibrated plan (no scale yet) is drawn one metre per
 * pixel with the origin at the bottom-left corner, and the caller says so on screen.
 */
export function planImageBoundsM(plan: PlanCalibrationInput): { bounds: MetreBounds; calibrated: boolean } {
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

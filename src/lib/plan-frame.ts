/**
 * The coordinate frame of the capture plan view and the survey map: Leaflet's CRS.Simple with one map
 * unit = one metre of the plan frame (lat = y_m, lng = x_m), so stations, rooms, taps and contours are
 * all in plan metres with no conversion.
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

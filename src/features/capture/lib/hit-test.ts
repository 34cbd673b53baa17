/**
 * Tap hit test for the plan view: the station nearest a tap, within a radius measured in screen
 * pixels (a gloved fingertip covers about 10 mm; 24 px either side gives a 48 px target).
 * Distances are computed in metres and compared with radiusPx × metres-per-screen-pixel at the current
 * zoom, so the test needs no projection and runs in one pass over the level's stations.
 */

export const TAP_RADIUS_PX = 24;

export interface PointM {
  xM: number;
  yM: number;
}

export function nearestWithin<T extends PointM>(tap: PointM, points: readonly T[], radiusM: number): T | null {
  let best: T | null = null;
  let bestD2 = radiusM * radiusM;
  for (const p of points) {
    const dx = p.xM - tap.xM;
    const dy = p.yM - tap.yM;
    const d2 = dx * dx + dy * dy;
    if (d2 <= bestD2) {
      best = p;
      bestD2 = d2;
    }
  }
  return best;
}

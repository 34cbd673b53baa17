/**
 * Plan geometry that only the screen needs: image pixels ↔ Leaflet's CRS.Simple, an angle from two
 * clicks, and the scale-bar length. The plan-frame arithmetic itself (metres per pixel, pixel ↔ metres)
 * is shared/plans/calibration.ts, the same code the server runs.
 *
 * Leaflet's CRS.Simple has lat growing upwards; the image is laid over [[−height, 0], [0, width]], so a
 * pixel (column, row) sits at latlng (−row, column) and one map unit is one pixel of the original image.
 */
import { normaliseAngleDeg, type PixelPoint } from '@shared/plans/calibration';

export type { PixelPoint };

/**
 * Direction from a to b in degrees clockwise from the image's "up", in [0, 360) — how the north angle
 * is given (shared/schemas/plan.ts). Null when the points coincide.
 */
export function angleFromPointsDeg(a: PixelPoint, b: PixelPoint): number | null {
  const dx = b.xPx - a.xPx;
  const dyUp = a.yPx - b.yPx; // image rows grow downwards
  if (dx === 0 && dyUp === 0) return null;
  return normaliseAngleDeg((Math.atan2(dx, dyUp) * 180) / Math.PI);
}

/** Leaflet CRS.Simple latlng of an image pixel, as [lat, lng]. */
export function pixelToLatLng(point: PixelPoint): [number, number] {
  return [-point.yPx, point.xPx];
}

export function latLngToPixel(latLng: { lat: number; lng: number }): PixelPoint {
  return { xPx: latLng.lng, yPx: -latLng.lat };
}

/** Bounds of the whole image in CRS.Simple. */
export function imageBounds(widthPx: number, heightPx: number): [[number, number], [number, number]] {
  return [
    [-heightPx, 0],
    [0, widthPx],
  ];
}

/**
 * The longest "round" scale-bar length (1, 2 or 5 × 10ⁿ m) that fits in maxPixels on screen, and its
 * length in screen pixels (round 1-2-5 steps: common practice on map scale bars).
 */
export function niceScaleBar(metresPerScreenPixel: number, maxPixels: number): { lengthM: number; pixels: number } | null {
  if (!(metresPerScreenPixel > 0) || !(maxPixels > 0) || !Number.isFinite(metresPerScreenPixel)) return null;
  const maxM = metresPerScreenPixel * maxPixels;
  const base = 10 ** Math.floor(Math.log10(maxM));
  const step = [5, 2, 1].find((s) => s * base <= maxM * (1 + 1e-12)) ?? 1;
  const lengthM = step * base;
  return { lengthM, pixels: lengthM / metresPerScreenPixel };
}

/**
 * The plan screen's own geometry (src/features/site-setup/plan-geometry.ts), checked against values
 * worked by hand: right-angle bearings, a 3-4-5 triangle, and the 1-2-5 scale-bar steps.
 */
import { describe, expect, it } from 'vitest';
import { metresPerPixel, pixelToPlanM } from '@shared/plans/calibration';
import { angleFromPointsDeg, imageBounds, latLngToPixel, niceScaleBar, pixelToLatLng } from '@/features/site-setup/plan-geometry';

describe('plan geometry on the client', () => {
  it('gives north angles clockwise from the top of the image', () => {
    const from = { xPx: 100, yPx: 100 };
    expect(angleFromPointsDeg(from, { xPx: 100, yPx: 50 })).toBe(0); // straight up
    expect(angleFromPointsDeg(from, { xPx: 150, yPx: 100 })).toBe(90); // right
    expect(angleFromPointsDeg(from, { xPx: 100, yPx: 150 })).toBe(180); // down
    expect(angleFromPointsDeg(from, { xPx: 50, yPx: 100 })).toBe(270); // left
    // Up and right in a 3-4-5 triangle: atan(3/4) = 36.8699° (worked by hand).
    expect(angleFromPointsDeg(from, { xPx: 103, yPx: 96 })).toBeCloseTo(36.8699, 3);
    expect(angleFromPointsDeg(from, from)).toBeNull();
  });

  it('puts pixels on Leaflet CRS.Simple and back, with the image top-left at (0, 0)', () => {
    expect(pixelToLatLng({ xPx: 30, yPx: 40 })).toEqual([-40, 30]);
    expect(latLngToPixel({ lat: -40, lng: 30 })).toEqual({ xPx: 30, yPx: 40 });
    expect(imageBounds(1200, 800)).toEqual([
      [-800, 0],
      [0, 1200],
    ]);
  });

  it('with the shared calibration: two clicks 500 px apart (3-4-5) for 12.5 m give 0.025 m/px', () => {
    const scale = metresPerPixel({ xPx: 0, yPx: 0 }, { xPx: 300, yPx: 400 }, 12.5);
    expect(scale).toBeCloseTo(0.025, 12);
    // 40 px right of and 80 px above the origin → (1 m, 2 m): y grows up the image.
    expect(pixelToPlanM({ xPx: 140, yPx: 120 }, { metresPerPixel: scale, originXPx: 100, originYPx: 200, northAngleDeg: 0 })).toEqual({
      xM: expect.closeTo(1, 12),
      yM: expect.closeTo(2, 12),
    });
  });

  it('picks the longest 1-2-5 scale bar that fits', () => {
    // 0.05 m per screen pixel, 160 px → at most 8 m → a 5 m bar of 100 px.
    expect(niceScaleBar(0.05, 160)).toEqual({ lengthM: 5, pixels: 100 });
    // 0.01 m/px, 160 px → 1.6 m → 1 m bar, 100 px.
    expect(niceScaleBar(0.01, 160)).toEqual({ lengthM: 1, pixels: 100 });
    // exactly 2 m fits: 0.0125 m/px × 160 px = 2 m.
    expect(niceScaleBar(0.0125, 160)?.lengthM).toBe(2);
    expect(niceScaleBar(0, 160)).toBeNull();
  });
});

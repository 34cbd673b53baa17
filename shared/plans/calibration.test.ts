/**
 * Calibration arithmetic checked against values computed by hand (worked out in the comments), and the
 * point-to-point distance cross-checked with mathjs's `distance` (a general-purpose reference library).
 */
import { distance } from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  CalibrationError,
  metresPerPixel,
  normaliseAngleDeg,
  pixelToPlanM,
  planMToPixel,
  planToNorthEast,
  reprojectPoint,
  type PlanCalibration,
} from './calibration';

describe('metresPerPixel', () => {
  it('is the distance over the pixel span: a 3-4-5 triangle of 300 × 400 px spanning 10 m gives 0.02 m/px (by hand: 10 / 500)', () => {
    expect(metresPerPixel({ xPx: 100, yPx: 100 }, { xPx: 400, yPx: 500 }, 10)).toBeCloseTo(0.02, 15);
  });

  it('along one row: 250 px for 5 m is 0.02 m/px (by hand: 5 / 250)', () => {
    expect(metresPerPixel({ xPx: 0, yPx: 40 }, { xPx: 250, yPx: 40 }, 5)).toBeCloseTo(0.02, 15);
  });

  it('agrees with mathjs’s Euclidean distance for an arbitrary pair', () => {
    const a = { xPx: 12.5, yPx: 880.25 };
    const b = { xPx: 1931.75, yPx: 77.5 };
    const spanPx = distance([a.xPx, a.yPx], [b.xPx, b.yPx]) as number;
    expect(metresPerPixel(a, b, 42.7)).toBeCloseTo(42.7 / spanPx, 12);
  });

  it('refuses coincident points, a zero distance and non-finite input', () => {
    expect(() => metresPerPixel({ xPx: 5, yPx: 5 }, { xPx: 5.5, yPx: 5 }, 1)).toThrow(CalibrationError);
    expect(() => metresPerPixel({ xPx: 0, yPx: 0 }, { xPx: 10, yPx: 0 }, 0)).toThrow(/greater than zero/);
    expect(() => metresPerPixel({ xPx: Number.NaN, yPx: 0 }, { xPx: 10, yPx: 0 }, 1)).toThrow(/finite/);
  });
});

describe('pixel ↔ plan metres (y up the image)', () => {
  // Origin at the bottom-left corner of a 960 × 600 px image, 0.1 m/px (the demo plans' scale).
  const cal: PlanCalibration = { metresPerPixel: 0.1, originXPx: 0, originYPx: 600, northAngleDeg: 0 };

  it('maps the origin pixel to (0, 0) and the top-right corner to (96 m, 60 m) (by hand: 960·0.1, (600−0)·0.1)', () => {
    expect(pixelToPlanM({ xPx: 0, yPx: 600 }, cal)).toEqual({ xM: 0, yM: 0 });
    const corner = pixelToPlanM({ xPx: 960, yPx: 0 }, cal);
    expect(corner.xM).toBeCloseTo(96, 12);
    expect(corner.yM).toBeCloseTo(60, 12);
  });

  it('a pixel lower in the image has a smaller y in metres', () => {
    expect(pixelToPlanM({ xPx: 100, yPx: 500 }, cal).yM).toBeGreaterThan(pixelToPlanM({ xPx: 100, yPx: 550 }, cal).yM);
  });

  it('with an origin inside the image: pixel (130, 70), origin (100, 100), 0.5 m/px → (15 m, 15 m) (by hand: 30·0.5, 30·0.5)', () => {
    const inner: PlanCalibration = { metresPerPixel: 0.5, originXPx: 100, originYPx: 100, northAngleDeg: 0 };
    expect(pixelToPlanM({ xPx: 130, yPx: 70 }, inner)).toEqual({ xM: 15, yM: 15 });
    expect(planMToPixel({ xM: 15, yM: 15 }, inner)).toEqual({ xPx: 130, yPx: 70 });
  });

  it('planMToPixel inverts pixelToPlanM', () => {
    const p = { xPx: 321.5, yPx: 77.25 };
    const back = planMToPixel(pixelToPlanM(p, cal), cal);
    expect(back.xPx).toBeCloseTo(p.xPx, 9);
    expect(back.yPx).toBeCloseTo(p.yPx, 9);
  });
});

describe('north angle', () => {
  it('north straight up: east = x, north = y', () => {
    expect(planToNorthEast({ xM: 3, yM: 4 }, 0)).toEqual({ eastM: 3, northM: 4 });
  });
  it('north pointing to the image’s right (90°): a point 5 m up the image is 5 m WEST (by hand: east = −y, north = x)', () => {
    const p = planToNorthEast({ xM: 0, yM: 5 }, 90);
    expect(p.eastM).toBeCloseTo(-5, 12);
    expect(p.northM).toBeCloseTo(0, 12);
  });
  it('normalises angles into [0, 360)', () => {
    expect(normaliseAngleDeg(360)).toBe(0);
    expect(normaliseAngleDeg(-90)).toBe(270);
    expect(normaliseAngleDeg(725)).toBe(5);
  });
});

describe('re-calibration keeps pixels', () => {
  it('a station at (10 m, 5 m) under 0.1 m/px becomes (20 m, 10 m) when the scale is corrected to 0.2 m/px (same origin; by hand: pixel (100, 550) → (100·0.2, 50·0.2))', () => {
    const before: PlanCalibration = { metresPerPixel: 0.1, originXPx: 0, originYPx: 600, northAngleDeg: 0 };
    const after: PlanCalibration = { ...before, metresPerPixel: 0.2 };
    const moved = reprojectPoint({ xM: 10, yM: 5 }, before, after);
    expect(moved.xM).toBeCloseTo(20, 12);
    expect(moved.yM).toBeCloseTo(10, 12);
  });
  it('moving the origin 50 px right shifts every point 5 m left at 0.1 m/px (by hand)', () => {
    const before: PlanCalibration = { metresPerPixel: 0.1, originXPx: 0, originYPx: 600, northAngleDeg: 0 };
    const moved = reprojectPoint({ xM: 10, yM: 5 }, before, { ...before, originXPx: 50 });
    expect(moved.xM).toBeCloseTo(5, 12);
    expect(moved.yM).toBeCloseTo(5, 12);
  });
});

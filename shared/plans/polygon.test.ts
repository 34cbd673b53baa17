/**
 * Point-in-polygon and room lookup, checked by hand on simple shapes and against Turf's
 * booleanPointInPolygon (@turf/boolean-point-in-polygon, a general-purpose reference library) on random
 * points around an irregular outline.
 */
import { booleanPointInPolygon } from '@turf/boolean-point-in-polygon';
import { describe, expect, it } from 'vitest';
import { isSimplePolygon, pointInPolygon, polygonAreaM2, roomForPoint, type PolygonM } from './polygon';

const square: PolygonM = [
  [0, 0],
  [10, 0],
  [10, 10],
  [0, 10],
];
// An L-shaped corridor (concave), 8 corners.
const ell: PolygonM = [
  [0, 0],
  [20, 0],
  [20, 4],
  [4, 4],
  [4, 15],
  [0, 15],
  [0, 7.5],
  [0, 3],
];

describe('pointInPolygon', () => {
  it('inside, outside and on the edge of a square (by hand)', () => {
    expect(pointInPolygon(5, 5, square)).toBe(true);
    expect(pointInPolygon(15, 5, square)).toBe(false);
    expect(pointInPolygon(-0.001, 5, square)).toBe(false);
    expect(pointInPolygon(10, 5, square)).toBe(true); // on a wall: belongs to the room
    expect(pointInPolygon(0, 0, square)).toBe(true); // a corner
  });

  it('the notch of an L is outside (by hand: (10, 10) is above the 4 m-deep arm and right of the 4 m-wide one)', () => {
    expect(pointInPolygon(10, 10, ell)).toBe(false);
    expect(pointInPolygon(10, 2, ell)).toBe(true);
    expect(pointInPolygon(2, 12, ell)).toBe(true);
  });

  it('agrees with Turf on 2,000 pseudo-random points around the L (edges excluded)', () => {
    let seed = 12345;
    const next = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const ring = [...ell.map(([x, y]) => [x, y]), [ell[0]![0], ell[0]![1]]];
    const turfPolygon = { type: 'Polygon' as const, coordinates: [ring] };
    for (let i = 0; i < 2000; i += 1) {
      const x = next() * 26 - 3;
      const y = next() * 21 - 3;
      const turf = booleanPointInPolygon([x, y], turfPolygon, { ignoreBoundary: false });
      expect(pointInPolygon(x, y, ell), `(${x}, ${y})`).toBe(turf);
    }
  });
});

describe('polygonAreaM2', () => {
  it('square 10 × 10 = 100 m²; L = 20·4 + 4·11 = 124 m² (by hand); winding does not matter', () => {
    expect(polygonAreaM2(square)).toBe(100);
    expect(polygonAreaM2(ell)).toBeCloseTo(124, 12);
    expect(polygonAreaM2([...square].reverse())).toBe(100);
  });
});

describe('isSimplePolygon', () => {
  it('accepts a square and an L, refuses a bow tie', () => {
    expect(isSimplePolygon(square)).toBe(true);
    expect(isSimplePolygon(ell)).toBe(true);
    expect(
      isSimplePolygon([
        [0, 0],
        [10, 10],
        [10, 0],
        [0, 10],
      ]),
    ).toBe(false);
  });
});

describe('roomForPoint', () => {
  const hall = { id: 'hall', polygon: square };
  const store = {
    id: 'store',
    polygon: [
      [1, 1],
      [3, 1],
      [3, 3],
      [1, 3],
    ] as PolygonM,
  };
  it('gives the smallest room where outlines overlap, whatever the order', () => {
    expect(roomForPoint([hall, store], 2, 2)?.id).toBe('store');
    expect(roomForPoint([store, hall], 2, 2)?.id).toBe('store');
    expect(roomForPoint([hall, store], 8, 8)?.id).toBe('hall');
  });
  it('gives null outside every room', () => {
    expect(roomForPoint([hall, store], 50, 50)).toBeNull();
  });
});

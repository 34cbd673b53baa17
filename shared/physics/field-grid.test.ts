import { describe, expect, it } from 'vitest';
import { dipoleFieldMagnitudeTesla, dipoleThresholdRadiusM, type DipoleModel } from './dipole';
import { PhysicsInputError } from './errors';
import { gridCellFieldTesla, gridForStations, interpolateLogFieldGrid, isogaussContours } from './field-grid';
import { mulberry32 } from '../random/mulberry32';


function scatter(n: number, seed: number, half: number): { xM: Float64Array; yM: Float64Array } {
  const rand = mulberry32(seed);
  const xM = new Float64Array(n);
  const yM = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xM[i] = (rand() * 2 - 1) * half;
    yM[i] = (rand() * 2 - 1) * half;
  }
  return { xM, yM };
}

describe('log|B| interpolation on the Delaunay triangulation', () => {
  it('reproduces a field whose log is a plane exactly (linear interpolation is exact for linear data)', () => {
    const { xM, yM } = scatter(300, 1, 10);
    const fieldsTesla = Float64Array.from(xM, (x, i) => 10 ** (-3 + 0.05 * x - 0.02 * (yM[i] as number)));
    const grid = interpolateLogFieldGrid({ xM, yM, fieldsTesla }, gridForStations(xM, yM, 64, 64));
    let checked = 0;
    for (let j = 0; j < 64; j++)
      for (let i = 0; i < 64; i++) {
        const idx = j * 64 + i;
        if (!grid.covered[idx]) {
          expect(grid.log10FieldTesla[idx]).toBeNaN();
          continue;
        }
        const x = grid.originXM + (i + 0.5) * grid.cellSizeM;
        const y = grid.originYM + (j + 0.5) * grid.cellSizeM;
        expect(grid.log10FieldTesla[idx]).toBeCloseTo(-3 + 0.05 * x - 0.02 * y, 9);
        checked++;
      }
    expect(checked).toBe(grid.coveredCount);
    expect(checked).toBeGreaterThan(0.8 * 64 * 64);
  });

  it('passes through the stations and marks cells outside the hull as uncovered', () => {
    const xM = Float64Array.from([0, 10, 0, 10]);
    const yM = Float64Array.from([0, 0, 10, 10]);
    const fieldsTesla = Float64Array.from([1e-3, 1e-4, 1e-4, 1e-5]);
    const grid = interpolateLogFieldGrid({ xM, yM, fieldsTesla }, { originXM: -5, originYM: -5, cellSizeM: 1, width: 20, height: 20 });
    // cell (5, 5) is centred at (0.5, 0.5): near the 1 mT corner
    expect(gridCellFieldTesla(grid, 5, 5)).toBeGreaterThan(5e-4);
    expect(grid.covered[0]).toBe(0);
    expect(() => gridCellFieldTesla(grid, 0, 0)).toThrow(expect.objectContaining({ code: 'OUT_OF_RANGE' }));
  });

  it('isogauss contours of a dipole field come back in metres at the (B₁/B₂)^(1/3) distances (Jackson §5.6)', () => {
    // stations on a horizontal plane through an invented vertical dipole: |B| = μ₀m/(4πr³) on the equator
    const magnet: DipoleModel = { sourceM: [0, 0, 0], momentAm2: [0, 0, 2e6] };
    const rand = mulberry32(3);
    const n = 4000;
    const xM = new Float64Array(n);
    const yM = new Float64Array(n);
    const fieldsTesla = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let x: number;
      let y: number;
      do {
        x = (rand() * 2 - 1) * 20;
        y = (rand() * 2 - 1) * 20;
      } while (Math.hypot(x, y) < 2);
      xM[i] = x;
      yM[i] = y;
      fieldsTesla[i] = dipoleFieldMagnitudeTesla(magnet, [x, y, 0]);
    }
    const grid = interpolateLogFieldGrid({ xM, yM, fieldsTesla }, gridForStations(xM, yM, 256, 256));
    const levels = [0.5e-3, 3e-3];
    const contours = isogaussContours(grid, levels);
    const meanRadius = (level: number) => {
      const contour = contours.find((c) => c.levelTesla === level);
      // the outer ring of the largest polygon
      const rings = (contour?.polygons ?? []).map((p) => p[0] ?? []);
      const ring = rings.sort((a, b) => b.length - a.length)[0] ?? [];
      return ring.reduce((s, [x, y]) => s + Math.hypot(x, y), 0) / ring.length;
    };
    const r05 = meanRadius(0.5e-3);
    const r3 = meanRadius(3e-3);
    expect(r05 / dipoleThresholdRadiusM(magnet, 0.5e-3, [1, 0, 0])).toBeCloseTo(1, 2);
    expect(r05 / r3).toBeCloseTo(6 ** (1 / 3), 1);
  });
});

describe('field-grid input errors', () => {
  const xM = Float64Array.from([0, 1, 0]);
  const yM = Float64Array.from([0, 0, 1]);
  const grid = { originXM: 0, originYM: 0, cellSizeM: 0.1, width: 10, height: 10 };

  it.each([0, -1e-3, NaN, Infinity, -Infinity])('station field %s is refused', (bad) => {
    expect(() => interpolateLogFieldGrid({ xM, yM, fieldsTesla: Float64Array.from([1e-3, bad, 1e-3]) }, grid)).toThrow(PhysicsInputError);
  });

  it('fewer than three stations, or collinear ones, are INSUFFICIENT_DATA', () => {
    expect(() => interpolateLogFieldGrid({ xM: xM.subarray(0, 2), yM: yM.subarray(0, 2), fieldsTesla: Float64Array.from([1, 1]) }, grid)).toThrow(
      expect.objectContaining({ code: 'INSUFFICIENT_DATA' }),
    );
    expect(() =>
      interpolateLogFieldGrid({ xM: Float64Array.from([0, 1, 2]), yM: Float64Array.from([0, 1, 2]), fieldsTesla: Float64Array.from([1, 1, 1]) }, grid),
    ).toThrow(expect.objectContaining({ code: 'INSUFFICIENT_DATA' }));
  });

  it('bad grids, positions and contour levels are refused', () => {
    const fieldsTesla = Float64Array.from([1e-3, 1e-3, 1e-3]);
    expect(() => interpolateLogFieldGrid({ xM, yM, fieldsTesla }, { ...grid, cellSizeM: 0 })).toThrow(PhysicsInputError);
    expect(() => interpolateLogFieldGrid({ xM, yM, fieldsTesla }, { ...grid, width: 1.5 })).toThrow(PhysicsInputError);
    expect(() => interpolateLogFieldGrid({ xM, yM, fieldsTesla }, { ...grid, originXM: NaN })).toThrow(PhysicsInputError);
    expect(() => interpolateLogFieldGrid({ xM: Float64Array.from([0, NaN, 0]), yM, fieldsTesla }, grid)).toThrow(PhysicsInputError);
    const g = interpolateLogFieldGrid({ xM, yM, fieldsTesla }, grid);
    expect(() => isogaussContours(g, [])).toThrow(PhysicsInputError);
    for (const bad of [0, -1, NaN, Infinity]) expect(() => isogaussContours(g, [bad])).toThrow(PhysicsInputError);
    expect(() => gridForStations(new Float64Array(0), new Float64Array(0), 4, 4)).toThrow(PhysicsInputError);
    expect(() => gridForStations(xM, yM, 4, 4, -1)).toThrow(PhysicsInputError);
  });
});

describe('degenerate station sets', () => {
  it('three readings at one spot, or two spots, are INSUFFICIENT_DATA', () => {
    const grid = { originXM: 0, originYM: 0, cellSizeM: 1, width: 4, height: 4 };
    const fieldsTesla = Float64Array.from([1e-3, 1e-3, 1e-3]);
    for (const [xs, ys] of [
      [[1, 1, 1], [2, 2, 2]],
      [[0, 1, 1], [0, 1, 1]],
    ]) {
      expect(() => interpolateLogFieldGrid({ xM: Float64Array.from(xs as number[]), yM: Float64Array.from(ys as number[]), fieldsTesla }, grid)).toThrow(
        expect.objectContaining({ code: 'INSUFFICIENT_DATA' }),
      );
    }
  });
});

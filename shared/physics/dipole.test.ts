import { describe, expect, it } from 'vitest';
import {
  dipoleFieldMagnitudeTesla,
  dipoleFieldVectorTesla,
  dipoleThresholdRadiusM,
  distanceToThresholdAlongRayM,
  fitDipole,
  type DipoleModel,
  type Vec3,
} from './dipole';
import { PhysicsInputError } from './errors';
import { mulberry32 } from '../random/mulberry32';

const MU0 = 1.25663706212e-6; // CODATA 2018
const K = MU0 / (4 * Math.PI);

// Invented magnet (demo data): 1.8e6 A·m² along x, source 1.2 m above the floor.
const MAGNET: DipoleModel = { sourceM: [2, -1, 1.2], momentAm2: [1.8e6, 0, 0] };


describe('dipole field (Jackson §5.6; Griffiths §5.4)', () => {
  it('matches Griffiths’ spherical components B_r = μ₀m·2cosθ/(4πr³), B_θ = μ₀m·sinθ/(4πr³)', () => {
    const model: DipoleModel = { sourceM: [0, 0, 0], momentAm2: [0, 0, 1000] };
    for (const [r, theta] of [
      [1, 0.3],
      [2.5, 1.2],
      [7, 2.8],
    ] as const) {
      const point: Vec3 = [r * Math.sin(theta), 0, r * Math.cos(theta)];
      const br = (K * 1000 * 2 * Math.cos(theta)) / r ** 3;
      const bt = (K * 1000 * Math.sin(theta)) / r ** 3;
      // r̂ = (sinθ, 0, cosθ), θ̂ = (cosθ, 0, −sinθ)
      const expected = [br * Math.sin(theta) + bt * Math.cos(theta), 0, br * Math.cos(theta) - bt * Math.sin(theta)];
      const got = dipoleFieldVectorTesla(model, point);
      got.forEach((g, i) => expect(g).toBeCloseTo(expected[i] as number, 15));
      expect(dipoleFieldMagnitudeTesla(model, point)).toBeCloseTo(Math.hypot(...expected), 15);
    }
  });

  it('falls off as 1/r³ — not 1/r² — along any direction', () => {
    const at = (s: number): Vec3 => [2 + 3 * s, -1 + 4 * s, 1.2];
    const ratio = dipoleFieldMagnitudeTesla(MAGNET, at(2)) / dipoleFieldMagnitudeTesla(MAGNET, at(1));
    expect(ratio).toBeCloseTo(1 / 8, 12);
    expect(ratio).not.toBeCloseTo(1 / 4, 2);
  });

  it('has the angular factor √(1 + 3cos²θ): on axis twice the equatorial value', () => {
    const axis = dipoleFieldMagnitudeTesla(MAGNET, [2 + 5, -1, 1.2]);
    const equator = dipoleFieldMagnitudeTesla(MAGNET, [2, -1 + 5, 1.2]);
    expect(axis / equator).toBeCloseTo(2, 12);
    const theta = Math.PI / 3;
    const oblique = dipoleFieldMagnitudeTesla(MAGNET, [2 + 5 * Math.cos(theta), -1 + 5 * Math.sin(theta), 1.2]);
    expect(oblique / equator).toBeCloseTo(Math.sqrt(1 + 3 * Math.cos(theta) ** 2), 12);
  });

  it('isogauss distances scale as (B₁/B₂)^(1/3); 0.5 mT lies 2^(1/3) farther on axis than on the equator', () => {
    const r05 = dipoleThresholdRadiusM(MAGNET, 0.5e-3, [1, 0, 0]);
    const r3 = dipoleThresholdRadiusM(MAGNET, 3e-3, [1, 0, 0]);
    expect(r05 / r3).toBeCloseTo((3 / 0.5) ** (1 / 3), 12);
    expect(r05 / dipoleThresholdRadiusM(MAGNET, 0.5e-3, [0, 1, 0])).toBeCloseTo(2 ** (1 / 3), 12);
    // closed form from Jackson: r = (μ₀m·2/(4πB))^(1/3) on axis
    expect(r05).toBeCloseTo(Math.cbrt((K * 1.8e6 * 2) / 0.5e-3), 12);
  });

  it('the distance along a ray from the source equals the closed form; from elsewhere it is the outermost crossing', () => {
    expect(distanceToThresholdAlongRayM(MAGNET, MAGNET.sourceM, [1, 0, 0], 0.5e-3)).toBeCloseTo(dipoleThresholdRadiusM(MAGNET, 0.5e-3, [1, 0, 0]), 12);
    // from a point 3 m behind the source on the axis, walking forward through it
    const origin: Vec3 = [2 - 3, -1, 1.2];
    const d = distanceToThresholdAlongRayM(MAGNET, origin, [1, 0, 0], 0.5e-3);
    expect(d).toBeCloseTo(3 + dipoleThresholdRadiusM(MAGNET, 0.5e-3, [1, 0, 0]), 6);
    // a ray pointing away from a far point is below everywhere
    expect(distanceToThresholdAlongRayM(MAGNET, [2 + 100, -1, 1.2], [1, 0, 0], 0.5e-3)).toBe(0);
  });
});

describe('dipole fit', () => {
  const rand = mulberry32(7);
  const n = 400;
  const xM = new Float64Array(n);
  const yM = new Float64Array(n);
  const zM = new Float64Array(n);
  const fieldsTesla = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let x: number;
    let y: number;
    do {
      x = 2 + (rand() * 2 - 1) * 25;
      y = -1 + (rand() * 2 - 1) * 25;
    } while (Math.hypot(x - 2, y + 1) < 5); // several magnet lengths away
    xM[i] = x;
    yM[i] = y;
    zM[i] = rand() < 0.5 ? 0.5 : 1.8; // two probe heights break the mirror ambiguity
    fieldsTesla[i] = dipoleFieldMagnitudeTesla(MAGNET, [x, y, zM[i] as number]) * (1 + 0.01 * (rand() * 2 - 1));
  }

  it('recovers moment and position from ±1 % readings', () => {
    const fit = fitDipole({ xM, yM, zM, fieldsTesla });
    const [mx, my, mz] = fit.model.momentAm2;
    expect(Math.abs(Math.hypot(mx, my, mz) / 1.8e6 - 1)).toBeLessThan(0.01);
    expect(Math.abs(mx) / Math.hypot(mx, my, mz)).toBeGreaterThan(0.999);
    fit.model.sourceM.forEach((s, i) => expect(Math.abs(s - (MAGNET.sourceM[i] as number))).toBeLessThan(0.05));
    expect(fit.rmsLogResidual).toBeLessThan(0.01);
    expect(fit.relativeResiduals.every((r) => Math.abs(r) < 0.02)).toBe(true);
    expect(fit.fittedSource).toBe(true);
  });

  it('fits the moment alone when the source position is known', () => {
    const fit = fitDipole({ xM, yM, zM, fieldsTesla, knownSourceM: MAGNET.sourceM });
    expect(fit.model.sourceM).toEqual(MAGNET.sourceM);
    expect(Math.abs(Math.hypot(...fit.model.momentAm2) / 1.8e6 - 1)).toBeLessThan(0.005);
    expect(fit.fittedSource).toBe(false);
  });

  it('refuses bad stations and too few of them', () => {
    expect(() => fitDipole({ xM: xM.subarray(0, 5), yM: yM.subarray(0, 5), zM: zM.subarray(0, 5), fieldsTesla: fieldsTesla.subarray(0, 5) })).toThrow(
      expect.objectContaining({ code: 'INSUFFICIENT_DATA' }),
    );
    for (const bad of [0, -1e-3, NaN, Infinity, -Infinity]) {
      const f = Float64Array.from(fieldsTesla);
      f[3] = bad;
      expect(() => fitDipole({ xM, yM, zM, fieldsTesla: f })).toThrow(PhysicsInputError);
    }
    const x = Float64Array.from(xM);
    x[0] = NaN;
    expect(() => fitDipole({ xM: x, yM, zM, fieldsTesla })).toThrow(PhysicsInputError);
    expect(() => fitDipole({ xM, yM: yM.subarray(1), zM, fieldsTesla })).toThrow(expect.objectContaining({ code: 'LENGTH_MISMATCH' }));
    expect(() => fitDipole({ xM, yM, zM, fieldsTesla, knownSourceM: [0, NaN, 0] })).toThrow(PhysicsInputError);
  });
});

describe('dipole input errors', () => {
  it.each([0, -1e-3, NaN, Infinity, -Infinity])('threshold field %s is refused', (bad) => {
    expect(() => dipoleThresholdRadiusM(MAGNET, bad, [1, 0, 0])).toThrow(PhysicsInputError);
    expect(() => distanceToThresholdAlongRayM(MAGNET, [0, 0, 0], [1, 0, 0], bad)).toThrow(PhysicsInputError);
  });

  it('refuses a zero or non-finite moment, the source point itself, and zero directions', () => {
    expect(() => dipoleFieldMagnitudeTesla({ sourceM: [0, 0, 0], momentAm2: [0, 0, 0] }, [1, 0, 0])).toThrow(PhysicsInputError);
    expect(() => dipoleFieldMagnitudeTesla({ sourceM: [0, 0, 0], momentAm2: [Infinity, 0, 0] }, [1, 0, 0])).toThrow(PhysicsInputError);
    expect(() => dipoleFieldVectorTesla(MAGNET, MAGNET.sourceM)).toThrow(expect.objectContaining({ code: 'OUT_OF_RANGE' }));
    expect(() => dipoleFieldVectorTesla(MAGNET, [NaN, 0, 0])).toThrow(PhysicsInputError);
    expect(() => dipoleThresholdRadiusM(MAGNET, 1e-3, [0, 0, 0])).toThrow(PhysicsInputError);
    expect(() => distanceToThresholdAlongRayM(MAGNET, [0, 0, 0], [0, 0, 0], 1e-3)).toThrow(PhysicsInputError);
  });
});

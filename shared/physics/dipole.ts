/**
 * Magnetic dipole model of a magnet's far fringe field, and its least-squares fit to surveyed |B|.
 *
 *   B(r) = (μ₀/4π)·[3(m·r̂)r̂ − m]/r³          |B| = (μ₀|m|/4πr³)·√(1 + 3cos²θ)
 *
 * Source: Jackson, Classical Electrodynamics, 3rd ed., §5.6 (eq. for the field of a magnetic dipole);
 * Griffiths, Introduction to Electrodynamics, §5.4. On the axis the field is twice the equatorial value;
 * an isogauss distance scales as (B₁/B₂)^(1/3). Fringe fields do NOT fall as 1/r².
 *
 * Fit only stations several magnet lengths away: actively shielded magnets fall off faster than a
 * dipole close in. With magnitude-only readings the moment's sign is undetermined (m and −m give the
 * same |B|), and if every station lies in one horizontal plane the source height has a mirror
 * ambiguity about that plane: pass a known source position or a starting guess on the right side.
 */

import { VACUUM_PERMEABILITY_N_PER_A2 } from './constants';
import {
  PhysicsInputError,
  requireArray,
  requireFinite,
  requireInteger,
  requirePositive,
  requireSameLength,
} from './errors';
import { requireFieldTesla } from './kinematics';

/** A point or vector in metres (x, y, z), or a moment in A·m². */
export type Vec3 = readonly [number, number, number];

/** A point dipole: source position (m) and moment (A·m²). */
export interface DipoleModel {
  readonly sourceM: Vec3;
  readonly momentAm2: Vec3;
}

/** μ₀/4π in T·m/A. */
const K = VACUUM_PERMEABILITY_N_PER_A2 / (4 * Math.PI);

function requireVec3(v: Vec3, name: string): void {
  if (!Array.isArray(v) || v.length !== 3) {
    throw new PhysicsInputError('INVALID_INPUT', `${name} must have three components (x, y, z).`, { field: name, value: v });
  }
  requireFinite(v[0], `${name}[0]`);
  requireFinite(v[1], `${name}[1]`);
  requireFinite(v[2], `${name}[2]`);
}

function requireModel(model: DipoleModel): void {
  requireVec3(model.sourceM, 'sourceM');
  requireVec3(model.momentAm2, 'momentAm2');
  const m = Math.hypot(...model.momentAm2);
  requirePositive(m, '|momentAm2|');
}

function offsetFromSource(model: DipoleModel, pointM: Vec3): [number, number, number, number] {
  const dx = pointM[0] - model.sourceM[0];
  const dy = pointM[1] - model.sourceM[1];
  const dz = pointM[2] - model.sourceM[2];
  const r = Math.hypot(dx, dy, dz);
  if (!(r > 0)) {
    throw new PhysicsInputError('OUT_OF_RANGE', 'The point coincides with the dipole source: the field is undefined there.', {
      field: 'pointM',
      value: pointM,
    });
  }
  return [dx, dy, dz, r];
}

/**
 * Dipole field vector B = (μ₀/4π)·[3(m·r̂)r̂ − m]/r³ in T at `pointM` (Jackson §5.6; Griffiths §5.4).
 */
export function dipoleFieldVectorTesla(model: DipoleModel, pointM: Vec3): Vec3 {
  requireModel(model);
  requireVec3(pointM, 'pointM');
  const [dx, dy, dz, r] = offsetFromSource(model, pointM);
  const [mx, my, mz] = model.momentAm2;
  const mDotR = (mx * dx + my * dy + mz * dz) / r;
  const scale = K / (r * r * r);
  return [
    scale * ((3 * mDotR * dx) / r - mx),
    scale * ((3 * mDotR * dy) / r - my),
    scale * ((3 * mDotR * dz) / r - mz),
  ];
}

/** Unchecked |B|² · r⁸/K² = 3(m·d)² + |m|²r² (see module docblock) — used by the fit. */
function magnitudeUnchecked(sx: number, sy: number, sz: number, mx: number, my: number, mz: number, px: number, py: number, pz: number): number {
  const dx = px - sx;
  const dy = py - sy;
  const dz = pz - sz;
  const r2 = dx * dx + dy * dy + dz * dz;
  const md = mx * dx + my * dy + mz * dz;
  const q = 3 * md * md + (mx * mx + my * my + mz * mz) * r2;
  return (K * Math.sqrt(q)) / (r2 * r2);
}

/**
 * Dipole field magnitude |B| = (μ₀|m|/4πr³)·√(1 + 3cos²θ) in T, θ between m and the offset from the
 * source (Jackson §5.6; Griffiths §5.4).
 */
export function dipoleFieldMagnitudeTesla(model: DipoleModel, pointM: Vec3): number {
  requireModel(model);
  requireVec3(pointM, 'pointM');
  offsetFromSource(model, pointM);
  const [sx, sy, sz] = model.sourceM;
  const [mx, my, mz] = model.momentAm2;
  return magnitudeUnchecked(sx, sy, sz, mx, my, mz, pointM[0], pointM[1], pointM[2]);
}

function unit(v: Vec3, name: string): Vec3 {
  requireVec3(v, name);
  const n = Math.hypot(v[0], v[1], v[2]);
  requirePositive(n, `|${name}|`);
  return [v[0] / n, v[1] / n, v[2] / n];
}

/**
 * Distance from the source, along `directionUnit`, at which the dipole field falls to `thresholdTesla`:
 * r = (μ₀|m|·√(1 + 3cos²θ)/(4π·B_t))^(1/3) (Jackson §5.6). Isogauss distances scale as (B₁/B₂)^(1/3).
 */
export function dipoleThresholdRadiusM(model: DipoleModel, thresholdTesla: number, directionUnit: Vec3): number {
  requireModel(model);
  requireFieldTesla(thresholdTesla, 'thresholdTesla');
  const u = unit(directionUnit, 'directionUnit');
  const [mx, my, mz] = model.momentAm2;
  const m = Math.hypot(mx, my, mz);
  const cosTheta = (mx * u[0] + my * u[1] + mz * u[2]) / m;
  return Math.cbrt((K * m * Math.sqrt(1 + 3 * cosTheta * cosTheta)) / thresholdTesla);
}

/**
 * Distance along a ray from `originM` in `directionM` beyond which the dipole |B| stays below
 * `thresholdTesla` (the outermost crossing), in metres; 0 when the whole ray is already below.
 * Beyond |origin − source| + (2μ₀|m|/4πB_t)^(1/3) the field is below B_t in every direction, so the ray
 * is sampled from there inwards (2048 steps) and the crossing refined by bisection. A ray passing
 * within a sample step of the source may miss that narrow peak; rays from the source use the closed
 * form {@link dipoleThresholdRadiusM}.
 */
export function distanceToThresholdAlongRayM(
  model: DipoleModel,
  originM: Vec3,
  directionM: Vec3,
  thresholdTesla: number,
): number {
  requireModel(model);
  requireVec3(originM, 'originM');
  requireFieldTesla(thresholdTesla, 'thresholdTesla');
  const u = unit(directionM, 'directionM');
  const [sx, sy, sz] = model.sourceM;
  const [mx, my, mz] = model.momentAm2;
  const m = Math.hypot(mx, my, mz);
  const offset = Math.hypot(originM[0] - sx, originM[1] - sy, originM[2] - sz);
  if (offset === 0) return dipoleThresholdRadiusM(model, thresholdTesla, u);
  const sUpper = offset + Math.cbrt((2 * K * m) / thresholdTesla);
  const fieldAt = (s: number): number => {
    const px = originM[0] + s * u[0];
    const py = originM[1] + s * u[1];
    const pz = originM[2] + s * u[2];
    if (px === sx && py === sy && pz === sz) return Infinity;
    return magnitudeUnchecked(sx, sy, sz, mx, my, mz, px, py, pz);
  };
  const steps = 2048;
  let k = steps;
  while (k >= 0 && fieldAt((sUpper * k) / steps) < thresholdTesla) k--;
  if (k < 0) return 0;
  if (k === steps) return sUpper; // cannot happen by construction; kept as a guard
  let inside = (sUpper * k) / steps; // field ≥ threshold
  let outside = (sUpper * (k + 1)) / steps; // field < threshold
  for (let i = 0; i < 80 && outside - inside > 1e-12 * sUpper; i++) {
    const mid = 0.5 * (inside + outside);
    if (fieldAt(mid) >= thresholdTesla) inside = mid;
    else outside = mid;
  }
  return 0.5 * (inside + outside);
}

/** Stations for {@link fitDipole}: positions in metres and measured |B| in T. */
export interface DipoleFitInput {
  readonly xM: Float64Array;
  readonly yM: Float64Array;
  readonly zM: Float64Array;
  readonly fieldsTesla: Float64Array;
  /** Fix the source here and fit the moment alone. */
  readonly knownSourceM?: Vec3;
  /** Starting guess for the source when it is fitted (default: the field-weighted centroid of the stations). */
  readonly initialSourceM?: Vec3;
  /** Levenberg–Marquardt iteration cap per start (default 100). */
  readonly maxIterations?: number;
}

/** Result of {@link fitDipole}. */
export interface DipoleFit {
  readonly model: DipoleModel;
  /** Per station: measured/predicted − 1. */
  readonly relativeResiduals: Float64Array;
  /** Root-mean-square of ln(measured/predicted). */
  readonly rmsLogResidual: number;
  readonly iterations: number;
  readonly converged: boolean;
  readonly fittedSource: boolean;
}

/** Solves the small dense system A·x = b in place (Gaussian elimination with partial pivoting). */
function solveInPlace(a: Float64Array, b: Float64Array, n: number): boolean {
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let row = col + 1; row < n; row++) if (Math.abs(a[row * n + col] as number) > Math.abs(a[pivot * n + col] as number)) pivot = row;
    const p = a[pivot * n + col] as number;
    if (!(Math.abs(p) > 1e-300)) return false;
    if (pivot !== col) {
      for (let k = 0; k < n; k++) {
        const t = a[col * n + k] as number;
        a[col * n + k] = a[pivot * n + k] as number;
        a[pivot * n + k] = t;
      }
      const t = b[col] as number;
      b[col] = b[pivot] as number;
      b[pivot] = t;
    }
    for (let row = col + 1; row < n; row++) {
      const f = (a[row * n + col] as number) / p;
      if (f === 0) continue;
      for (let k = col; k < n; k++) a[row * n + k] = (a[row * n + k] as number) - f * (a[col * n + k] as number);
      b[row] = (b[row] as number) - f * (b[col] as number);
    }
  }
  for (let row = n - 1; row >= 0; row--) {
    let sum = b[row] as number;
    for (let k = row + 1; k < n; k++) sum -= (a[row * n + k] as number) * (b[k] as number);
    b[row] = sum / (a[row * n + row] as number);
  }
  return true;
}

/**
 * Least-squares dipole fit to |B| readings (Levenberg–Marquardt on ln|B|, i.e. relative residuals, with
 * the analytic Jacobian of ln|B| = ln(μ₀/4π) + ½·ln(3(m·d)² + |m|²r²) − 4·ln r, d = p − s). Fits moment
 * and source position (6 parameters), or the moment alone when `knownSourceM` is given. Starts from
 * three moment directions (x, y, z) and keeps the best. Model: Jackson §5.6.
 */
export function fitDipole(input: DipoleFitInput): DipoleFit {
  const { xM, yM, zM, fieldsTesla } = input;
  const count = fieldsTesla.length;
  requireSameLength(count, { xM, yM, zM });
  requireArray(xM, 'xM', 'finite');
  requireArray(yM, 'yM', 'finite');
  requireArray(zM, 'zM', 'finite');
  requireArray(fieldsTesla, 'fieldsTesla', 'positive');
  const fitSource = input.knownSourceM === undefined;
  const minimum = fitSource ? 7 : 4;
  if (count < minimum) {
    throw new PhysicsInputError(
      'INSUFFICIENT_DATA',
      `A dipole fit needs at least ${minimum} stations${fitSource ? ' (or a known source position)' : ''}; got ${count}.`,
      { field: 'fieldsTesla', value: count },
    );
  }
  const maxIterations = requireInteger(input.maxIterations ?? 100, 'maxIterations', 1, 10_000);
  if (input.knownSourceM) requireVec3(input.knownSourceM, 'knownSourceM');
  if (input.initialSourceM) requireVec3(input.initialSourceM, 'initialSourceM');

  const logB = new Float64Array(count);
  for (let i = 0; i < count; i++) logB[i] = Math.log(fieldsTesla[i] as number);

  // Starting source: known, given, or the B²-weighted centroid of the stations.
  let start: Vec3;
  if (input.knownSourceM) start = input.knownSourceM;
  else if (input.initialSourceM) start = input.initialSourceM;
  else {
    let w = 0;
    let cx = 0;
    let cy = 0;
    let cz = 0;
    for (let i = 0; i < count; i++) {
      const b = fieldsTesla[i] as number;
      const wi = b * b;
      w += wi;
      cx += wi * (xM[i] as number);
      cy += wi * (yM[i] as number);
      cz += wi * (zM[i] as number);
    }
    start = [cx / w, cy / w, cz / w];
  }
  // Moment scale from the median of |B|·r³/K (angular factor between 1 and 2).
  const scaleSamples = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const r = Math.hypot((xM[i] as number) - start[0], (yM[i] as number) - start[1], (zM[i] as number) - start[2]);
    scaleSamples[i] = ((fieldsTesla[i] as number) * r * r * r) / K / 1.5;
  }
  scaleSamples.sort();
  const momentScale = Math.max(scaleSamples[count >> 1] as number, 1e-30);

  // Parameters: [mx', my', mz'] (moment / momentScale) then [sx, sy, sz] when fitted.
  const nParams = fitSource ? 6 : 3;
  const jtj = new Float64Array(nParams * nParams);
  const jtr = new Float64Array(nParams);
  const system = new Float64Array(nParams * nParams);
  const step = new Float64Array(nParams);
  const grad = new Float64Array(6);

  const cost = (p: Float64Array): number => {
    const mx = (p[0] as number) * momentScale;
    const my = (p[1] as number) * momentScale;
    const mz = (p[2] as number) * momentScale;
    const sx = fitSource ? (p[3] as number) : start[0];
    const sy = fitSource ? (p[4] as number) : start[1];
    const sz = fitSource ? (p[5] as number) : start[2];
    let sum = 0;
    for (let i = 0; i < count; i++) {
      const pred = magnitudeUnchecked(sx, sy, sz, mx, my, mz, xM[i] as number, yM[i] as number, zM[i] as number);
      const res = Math.log(pred) - (logB[i] as number);
      sum += res * res;
    }
    return Number.isFinite(sum) ? sum : Infinity;
  };

  const runFrom = (initial: Float64Array): { p: Float64Array; cost: number; iterations: number; converged: boolean } => {
    const p = Float64Array.from(initial);
    const trial = new Float64Array(nParams);
    let current = cost(p);
    let lambda = 1e-3;
    let iterations = 0;
    let converged = false;
    for (; iterations < maxIterations; iterations++) {
      jtj.fill(0);
      jtr.fill(0);
      const mx = (p[0] as number) * momentScale;
      const my = (p[1] as number) * momentScale;
      const mz = (p[2] as number) * momentScale;
      const sx = fitSource ? (p[3] as number) : start[0];
      const sy = fitSource ? (p[4] as number) : start[1];
      const sz = fitSource ? (p[5] as number) : start[2];
      const m2 = mx * mx + my * my + mz * mz;
      for (let i = 0; i < count; i++) {
        const dx = (xM[i] as number) - sx;
        const dy = (yM[i] as number) - sy;
        const dz = (zM[i] as number) - sz;
        const r2 = dx * dx + dy * dy + dz * dz;
        const md = mx * dx + my * dy + mz * dz;
        const q = 3 * md * md + m2 * r2;
        const res = Math.log((K * Math.sqrt(q)) / (r2 * r2)) - (logB[i] as number);
        // ∂ln|B|/∂m = (3(m·d)d + r²m)/Q, scaled by momentScale for the scaled parameters.
        grad[0] = ((3 * md * dx + r2 * mx) / q) * momentScale;
        grad[1] = ((3 * md * dy + r2 * my) / q) * momentScale;
        grad[2] = ((3 * md * dz + r2 * mz) / q) * momentScale;
        if (fitSource) {
          // ∂ln|B|/∂s = −[(3(m·d)m + |m|²d)/Q − 4d/r²]
          grad[3] = -((3 * md * mx + m2 * dx) / q - (4 * dx) / r2);
          grad[4] = -((3 * md * my + m2 * dy) / q - (4 * dy) / r2);
          grad[5] = -((3 * md * mz + m2 * dz) / q - (4 * dz) / r2);
        }
        for (let a = 0; a < nParams; a++) {
          const ga = grad[a] as number;
          jtr[a] = (jtr[a] as number) + ga * res;
          for (let b = a; b < nParams; b++) jtj[a * nParams + b] = (jtj[a * nParams + b] as number) + ga * (grad[b] as number);
        }
      }
      for (let a = 0; a < nParams; a++) for (let b = 0; b < a; b++) jtj[a * nParams + b] = jtj[b * nParams + a] as number;

      let improved = false;
      for (let attempt = 0; attempt < 12; attempt++) {
        system.set(jtj);
        for (let a = 0; a < nParams; a++) {
          const d = jtj[a * nParams + a] as number;
          system[a * nParams + a] = d + lambda * Math.max(d, 1e-12);
          step[a] = -(jtr[a] as number);
        }
        if (!solveInPlace(system, step, nParams)) {
          lambda *= 10;
          continue;
        }
        for (let a = 0; a < nParams; a++) trial[a] = (p[a] as number) + (step[a] as number);
        const trialCost = cost(trial);
        if (trialCost < current) {
          const relativeDrop = (current - trialCost) / Math.max(current, 1e-300);
          p.set(trial);
          current = trialCost;
          lambda = Math.max(lambda / 10, 1e-12);
          improved = true;
          if (relativeDrop < 1e-12) converged = true;
          break;
        }
        lambda *= 10;
      }
      if (!improved || converged || current < 1e-28) {
        converged = true;
        break;
      }
    }
    return { p, cost: current, iterations: iterations + 1, converged };
  };

  let best: { p: Float64Array; cost: number; iterations: number; converged: boolean } | undefined;
  let totalIterations = 0;
  for (const direction of [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ] as const) {
    const initial = new Float64Array(nParams);
    initial[0] = direction[0];
    initial[1] = direction[1];
    initial[2] = direction[2];
    if (fitSource) {
      initial[3] = start[0];
      initial[4] = start[1];
      initial[5] = start[2];
    }
    const run = runFrom(initial);
    totalIterations += run.iterations;
    if (!best || run.cost < best.cost) best = run;
  }
  const p = (best as { p: Float64Array }).p;
  const model: DipoleModel = {
    sourceM: fitSource ? [p[3] as number, p[4] as number, p[5] as number] : start,
    momentAm2: [(p[0] as number) * momentScale, (p[1] as number) * momentScale, (p[2] as number) * momentScale],
  };
  if (!(Math.hypot(...model.momentAm2) > 0) || !model.sourceM.every(Number.isFinite)) {
    throw new PhysicsInputError('INSUFFICIENT_DATA', 'The dipole fit did not converge on these stations.', {
      field: 'fieldsTesla',
    });
  }
  const relativeResiduals = new Float64Array(count);
  let sumLog2 = 0;
  const [sx, sy, sz] = model.sourceM;
  const [mx, my, mz] = model.momentAm2;
  for (let i = 0; i < count; i++) {
    const pred = magnitudeUnchecked(sx, sy, sz, mx, my, mz, xM[i] as number, yM[i] as number, zM[i] as number);
    const measured = fieldsTesla[i] as number;
    relativeResiduals[i] = measured / pred - 1;
    const l = Math.log(measured / pred);
    sumLog2 += l * l;
  }
  return {
    model,
    relativeResiduals,
    rmsLogResidual: Math.sqrt(sumLog2 / count),
    iterations: totalIterations,
    converged: (best as { converged: boolean }).converged,
    fittedSource: fitSource,
  };
}

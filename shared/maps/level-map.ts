/**
 * The computations behind a survey map, one level at a time, pure (no DOM, no Node API) so the server
 * runs them and the unit tests check them against closed-form fields:
 *
 * - the interpolated log₁₀|B| grid of the level's stations and its isogauss contours at the zone set's
 *   thresholds plus any extra levels (shared/physics/field-grid.ts: linear on the Delaunay triangulation
 *   of log|B|, marching squares), with a point on every ring to hang its label on;
 * - the surveyed area (the stations' convex hull), outside of which the grid says nothing;
 * - the distance along a ray from a source to the outermost crossing of a contour line (for comparing
 *   surveys), and whether that crossing is only the contour closing along the edge of the surveyed area;
 * - a dipole fit per magnet (shared/physics/dipole.ts, Jackson §5.6) with its residuals, and the fitted
 *   dipole's isogauss lines in the stations' plane, which extrapolate beyond the measured stations.
 *
 * Coordinates are plan metres of the level (x right, y up the plan). Bearings are degrees clockwise from
 * "up the plan" (+y), the way a person reads a drawing; the plan's north angle is not applied.
 */
import { Delaunay } from 'd3-delaunay';
import {
  dipoleFieldMagnitudeTesla,
  distanceToThresholdAlongRayM,
  fitDipole,
  gridForStations,
  interpolateLogFieldGrid,
  isogaussContours,
  PhysicsInputError,
  type DipoleFit,
  type RingM,
} from '../physics';

/** Longest side of a level's grid, in cells. 256 keeps a survey map well under a second of server time. */
export const MAP_GRID_MAX_CELLS_PER_SIDE = 256;

/** Stations nearer a magnet than this are left out of its dipole fit (the near field is not a dipole; common practice). */
export const DIPOLE_FIT_MIN_DISTANCE_M = 1.5;

/**
 * Stations a dipole fit uses at most: beyond this an evenly spread subset (every k-th) is fitted, and the
 * residuals are still given for every station. Three moment components from 200 points are well
 * determined; fitting 25,000 would only cost time.
 */
export const DIPOLE_FIT_MAX_STATIONS = 200;

/** Angular steps of a fitted dipole's isogauss line (5°). */
export const DIPOLE_CONTOUR_STEPS = 72;

export interface LevelStationInput {
  readonly id: string;
  readonly xM: number;
  readonly yM: number;
  /** Height above the level's floor of the reading used, m. */
  readonly heightM: number;
  /** |B| of the station's latest reading taking part, T; null when it has none. */
  readonly fieldT: number | null;
}

export interface ContourLine {
  readonly levelT: number;
  /** MultiPolygon coordinates in plan metres: polygons of rings (outer first, then holes), enclosing |B| ≥ levelT. */
  readonly polygons: RingM[][];
  /** One point per ring of reasonable length, on the ring, where its label goes. */
  readonly labelPoints: [number, number][];
}

export interface LevelField {
  readonly grid: { originXM: number; originYM: number; cellSizeM: number; width: number; height: number };
  /** The surveyed area: the convex hull of the stations with a value (closed ring). */
  readonly coverage: RingM;
  readonly contours: ContourLine[];
}

export type LevelFieldResult = { ok: true; field: LevelField } | { ok: false; reason: string };

/** Grid cells for a bounding box: the longer side gets `maxCells`, the shorter side in proportion (≥ 8). */
export function gridShape(widthM: number, heightM: number, maxCells = MAP_GRID_MAX_CELLS_PER_SIDE): { width: number; height: number } {
  const w = Math.max(widthM, 1e-9);
  const h = Math.max(heightM, 1e-9);
  if (w >= h) return { width: maxCells, height: Math.max(8, Math.ceil((maxCells * h) / w)) };
  return { width: Math.max(8, Math.ceil((maxCells * w) / h)), height: maxCells };
}

/** A point on a ring to carry its label: the vertex a quarter of the way round (the ring's start is arbitrary). */
function labelPoint(ring: RingM): [number, number] | null {
  if (ring.length < 4) return null;
  const p = ring[Math.floor(ring.length / 4)];
  return p ? [p[0], p[1]] : null;
}

/**
 * The interpolated field and contours of one level. Fewer than three stations with a value, or stations
 * on one line, give `{ ok: false, reason }` (said on the map) rather than an error.
 */
export function computeLevelField(stations: readonly LevelStationInput[], levelsT: readonly number[], maxCells = MAP_GRID_MAX_CELLS_PER_SIDE): LevelFieldResult {
  const measured = stations.filter((s) => s.fieldT !== null && s.fieldT > 0 && Number.isFinite(s.fieldT));
  if (measured.length < 3) return { ok: false, reason: 'Contours need readings at three or more stations on this level.' };
  const xM = Float64Array.from(measured, (s) => s.xM);
  const yM = Float64Array.from(measured, (s) => s.yM);
  const fieldsTesla = Float64Array.from(measured, (s) => s.fieldT as number);
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (const s of measured) {
    minX = Math.min(minX, s.xM);
    maxX = Math.max(maxX, s.xM);
    minY = Math.min(minY, s.yM);
    maxY = Math.max(maxY, s.yM);
  }
  const shape = gridShape(maxX - minX, maxY - minY, maxCells);
  const spec = gridForStations(xM, yM, shape.width, shape.height);
  try {
    const grid = interpolateLogFieldGrid({ xM, yM, fieldsTesla }, spec);
    const contours = levelsT.length > 0 ? isogaussContours(grid, levelsT) : [];
    const hull = new Delaunay(Float64Array.from(measured.flatMap((s) => [s.xM, s.yM]))).hullPolygon();
    return {
      ok: true,
      field: {
        grid: { originXM: spec.originXM, originYM: spec.originYM, cellSizeM: spec.cellSizeM, width: spec.width, height: spec.height },
        coverage: hull.map(([x, y]) => [x, y] as [number, number]),
        contours: contours.map((c) => ({
          levelT: c.levelTesla,
          polygons: c.polygons,
          labelPoints: c.polygons.flatMap((polygon) => polygon.map(labelPoint).filter((p): p is [number, number] => p !== null)),
        })),
      },
    };
  } catch (error) {
    if (error instanceof PhysicsInputError && error.code === 'INSUFFICIENT_DATA') return { ok: false, reason: error.message };
    throw error;
  }
}

/** Unit vector of a bearing (degrees clockwise from +y). */
export function bearingVector(bearingDeg: number): [number, number] {
  const rad = (bearingDeg * Math.PI) / 180;
  return [Math.sin(rad), Math.cos(rad)];
}

/** Distance from (px, py) to the segment a–b. */
function distanceToSegment(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  const t = len2 > 0 ? Math.min(1, Math.max(0, ((px - ax) * dx + (py - ay) * dy) / len2)) : 0;
  return Math.hypot(px - (ax + t * dx), py - (ay + t * dy));
}

/** Shortest distance from a point to a closed ring's edges. */
export function distanceToRing(xM: number, yM: number, ring: RingM): number {
  let best = Infinity;
  for (let i = 0; i + 1 < ring.length; i++) {
    const a = ring[i] as [number, number];
    const b = ring[i + 1] as [number, number];
    best = Math.min(best, distanceToSegment(xM, yM, a[0], a[1], b[0], b[1]));
  }
  return best;
}

export interface RayCrossing {
  /** Distance from the ray's origin to the outermost crossing of the line, m. */
  readonly distanceM: number;
  /** The crossing lies on the edge of the surveyed area: the line closes there, the true line may lie further out. */
  readonly atSurveyEdge: boolean;
}

/**
 * The outermost crossing of a contour line by the ray from (originX, originY) along `bearingDeg`, or null
 * when the ray meets no ring of it. `coverage` and `edgeToleranceM` mark crossings that are only the
 * contour closing along the surveyed area's edge.
 */
export function rayContourCrossing(
  contour: Pick<ContourLine, 'polygons'>,
  originXM: number,
  originYM: number,
  bearingDeg: number,
  coverage: RingM | null,
  edgeToleranceM: number,
): RayCrossing | null {
  const [ux, uy] = bearingVector(bearingDeg);
  let best = -Infinity;
  for (const polygon of contour.polygons) {
    for (const ring of polygon) {
      for (let i = 0; i + 1 < ring.length; i++) {
        const a = ring[i] as [number, number];
        const b = ring[i + 1] as [number, number];
        // origin + t·u = a + s·(b − a): solve by 2-D cross products.
        const ex = b[0] - a[0];
        const ey = b[1] - a[1];
        const denom = ux * ey - uy * ex;
        if (Math.abs(denom) < 1e-15) continue;
        const wx = a[0] - originXM;
        const wy = a[1] - originYM;
        const t = (wx * ey - wy * ex) / denom;
        const s = (wx * uy - wy * ux) / denom;
        if (t >= 0 && s >= 0 && s <= 1 && t > best) best = t;
      }
    }
  }
  if (!Number.isFinite(best)) return null;
  const x = originXM + best * ux;
  const y = originYM + best * uy;
  return { distanceM: best, atSurveyEdge: coverage !== null && coverage.length > 3 && distanceToRing(x, y, coverage) <= edgeToleranceM };
}

export interface SourceInput {
  readonly id: string;
  readonly xM: number;
  readonly yM: number;
  /** Height of the magnet's centre above the level's floor, m. */
  readonly zM: number;
}

export interface DipoleLayer {
  readonly sourceId: string;
  readonly momentAm2: [number, number, number];
  readonly momentMagnitudeAm2: number;
  readonly rmsLogResidual: number;
  readonly converged: boolean;
  /** Height of the plane the lines are drawn in (the mean reading height), m. */
  readonly planeHeightM: number;
  readonly residuals: { stationId: string; relativeResidual: number }[];
  /** The fitted dipole's isogauss lines in that plane, one closed ring per level. */
  readonly contours: { levelT: number; ring: RingM }[];
}

export type DipoleLayerResult = { ok: true; layer: DipoleLayer } | { ok: false; sourceId: string; reason: string };

/**
 * Dipole fits of one level: each station with a value goes to its nearest magnet (in plan), stations
 * nearer than {@link DIPOLE_FIT_MIN_DISTANCE_M} are left out, and each magnet's moment is fitted with its
 * position known (fitDipole, Levenberg–Marquardt on ln|B|; Jackson §5.6). The lines are the outermost
 * crossing of each level along {@link DIPOLE_CONTOUR_STEPS} horizontal rays from above the magnet.
 */
export function computeDipoleLayers(stations: readonly LevelStationInput[], sources: readonly SourceInput[], levelsT: readonly number[]): DipoleLayerResult[] {
  if (sources.length === 0) return [];
  const bySource = new Map<string, LevelStationInput[]>(sources.map((s) => [s.id, []]));
  for (const st of stations) {
    if (st.fieldT === null || !(st.fieldT > 0)) continue;
    let nearest: SourceInput | null = null;
    let nearestD = Infinity;
    for (const src of sources) {
      const d = Math.hypot(st.xM - src.xM, st.yM - src.yM);
      if (d < nearestD) {
        nearestD = d;
        nearest = src;
      }
    }
    if (nearest && nearestD >= DIPOLE_FIT_MIN_DISTANCE_M) bySource.get(nearest.id)!.push(st);
  }
  return sources.map((src): DipoleLayerResult => {
    const own = bySource.get(src.id) ?? [];
    if (own.length < 4) return { ok: false, sourceId: src.id, reason: 'A dipole fit needs four or more stations nearest this magnet (and at least 1.5 m from it).' };
    const stride = Math.ceil(own.length / DIPOLE_FIT_MAX_STATIONS);
    const fitted = stride > 1 ? own.filter((_, i) => i % stride === 0) : own;
    let fit: DipoleFit;
    try {
      fit = fitDipole({
        xM: Float64Array.from(fitted, (s) => s.xM),
        yM: Float64Array.from(fitted, (s) => s.yM),
        zM: Float64Array.from(fitted, (s) => s.heightM),
        fieldsTesla: Float64Array.from(fitted, (s) => s.fieldT as number),
        knownSourceM: [src.xM, src.yM, src.zM],
      });
    } catch (error) {
      if (error instanceof PhysicsInputError) return { ok: false, sourceId: src.id, reason: error.message };
      throw error;
    }
    // Residuals of every station against the fitted model (measured/predicted − 1), and their RMS in ln.
    let sumLog2 = 0;
    const residuals = own.map((s) => {
      const predicted = dipoleFieldMagnitudeTesla(fit.model, [s.xM, s.yM, s.heightM]);
      const ratio = (s.fieldT as number) / predicted;
      sumLog2 += Math.log(ratio) ** 2;
      return { stationId: s.id, relativeResidual: ratio - 1 };
    });
    const planeHeightM = own.reduce((sum, s) => sum + s.heightM, 0) / own.length;
    const contours = levelsT.map((levelT) => {
      const ring: RingM = [];
      for (let k = 0; k < DIPOLE_CONTOUR_STEPS; k++) {
        const [ux, uy] = bearingVector((360 * k) / DIPOLE_CONTOUR_STEPS);
        const r = distanceToThresholdAlongRayM(fit.model, [src.xM, src.yM, planeHeightM], [ux, uy, 0], levelT);
        ring.push([src.xM + r * ux, src.yM + r * uy]);
      }
      if (ring[0]) ring.push([ring[0][0], ring[0][1]]);
      return { levelT, ring };
    });
    const m = fit.model.momentAm2;
    return {
      ok: true,
      layer: {
        sourceId: src.id,
        momentAm2: [m[0], m[1], m[2]],
        momentMagnitudeAm2: Math.hypot(m[0], m[1], m[2]),
        rmsLogResidual: Math.sqrt(sumLog2 / own.length),
        converged: fit.converged,
        planeHeightM,
        residuals,
        contours,
      },
    };
  });
}

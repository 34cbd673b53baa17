/**
 * Survey-wide field maps: log₁₀|B| interpolated from scattered stations onto a regular grid, and
 * isogauss contours of that grid.
 *
 * Interpolation is linear (barycentric) on the Delaunay triangulation of the stations (d3-delaunay),
 * applied to log₁₀|B| rather than |B| because fringe fields fall off roughly as 1/r³ (Jackson §5.6):
 * linear-in-log follows a power law far better between stations. Each grid cell's triangle is found by
 * a visibility walk that starts from the previous cell's triangle (Lawson's oriented walk; Devillers,
 * Pion & Teillaud, "Walking in a triangulation", 2002), so a raster costs a few steps per cell.
 *
 * Grid convention: cell (i, j) is centred at (originXM + (i + ½)·cellSizeM, originYM + (j + ½)·cellSizeM),
 * stored row-major at index j·width + i. Cells outside the stations' convex hull have no value: they
 * are NaN in `log10FieldTesla` AND 0 in `covered` — always check `covered`, never the NaN.
 *
 * Contours use d3-contour's marching squares (sample i sits at contour coordinate i + ½, which maps to
 * metres as originXM + c·cellSizeM) and are returned in metres.
 */

import { contours as d3Contours } from 'd3-contour';
import { Delaunay } from 'd3-delaunay';
import { PhysicsInputError, requireArray, requireFinite, requireInteger, requirePositive, requireSameLength } from './errors';
import { requireFieldTesla } from './kinematics';

/** A regular grid in plan metres. */
export interface GridSpec {
  readonly originXM: number;
  readonly originYM: number;
  readonly cellSizeM: number;
  readonly width: number;
  readonly height: number;
}

/** Scattered stations: plan position (m) and |B| (T, > 0). */
export interface FieldStations {
  readonly xM: Float64Array;
  readonly yM: Float64Array;
  readonly fieldsTesla: Float64Array;
}

/** An interpolated field grid. */
export interface FieldGrid extends GridSpec {
  /** log₁₀(|B|/T) per cell; NaN where `covered` is 0. */
  readonly log10FieldTesla: Float64Array;
  /** 1 inside the stations' convex hull, 0 outside. */
  readonly covered: Uint8Array;
  readonly coveredCount: number;
}

/** Largest grid accepted (cells), ~16 M: a 4096² raster. */
const MAX_GRID_CELLS = 1 << 24;

function requireGridSpec(grid: GridSpec): void {
  requireFinite(grid.originXM, 'originXM');
  requireFinite(grid.originYM, 'originYM');
  requirePositive(grid.cellSizeM, 'cellSizeM');
  requireInteger(grid.width, 'width', 1, 65_536);
  requireInteger(grid.height, 'height', 1, 65_536);
  if (grid.width * grid.height > MAX_GRID_CELLS) {
    throw new PhysicsInputError('OUT_OF_RANGE', `The grid may have at most ${MAX_GRID_CELLS} cells.`, {
      field: 'width',
      value: grid.width * grid.height,
    });
  }
}

/**
 * A square-celled grid of `width` × `height` cells covering the stations' bounding box plus `paddingM`
 * (cells are square: the longer side of the box sets the cell size).
 */
export function gridForStations(xM: Float64Array, yM: Float64Array, width: number, height: number, paddingM = 0): GridSpec {
  requireSameLength(xM.length, { yM });
  if (xM.length === 0) throw new PhysicsInputError('INSUFFICIENT_DATA', 'No stations to grid.', { field: 'xM' });
  requireArray(xM, 'xM', 'finite');
  requireArray(yM, 'yM', 'finite');
  requireInteger(width, 'width', 1, 65_536);
  requireInteger(height, 'height', 1, 65_536);
  requireFinite(paddingM, 'paddingM');
  if (paddingM < 0) throw new PhysicsInputError('NEGATIVE_VALUE', 'paddingM cannot be negative.', { field: 'paddingM', value: paddingM });
  let minX = Infinity;
  let maxX = -Infinity;
  let minY = Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < xM.length; i++) {
    const x = xM[i] as number;
    const y = yM[i] as number;
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  minX -= paddingM;
  minY -= paddingM;
  maxX += paddingM;
  maxY += paddingM;
  const cellSizeM = Math.max((maxX - minX) / width, (maxY - minY) / height, 1e-9);
  return { originXM: minX, originYM: minY, cellSizeM, width, height };
}

/**
 * Interpolates log₁₀|B| of scattered stations onto `grid`: linear on the Delaunay triangulation
 * (barycentric weights λ; log₁₀B = Σλₖ·log₁₀Bₖ), NaN + covered = 0 outside the convex hull.
 * Coincident stations: only one of them is used (group repeat readings first; see repeats.ts).
 * Throws INSUFFICIENT_DATA for fewer than 3 stations or collinear stations.
 */
export function interpolateLogFieldGrid(stations: FieldStations, grid: GridSpec): FieldGrid {
  const { xM, yM, fieldsTesla } = stations;
  const n = fieldsTesla.length;
  requireSameLength(n, { xM, yM });
  requireArray(xM, 'xM', 'finite');
  requireArray(yM, 'yM', 'finite');
  requireArray(fieldsTesla, 'fieldsTesla', 'positive');
  requireGridSpec(grid);
  if (n < 3) throw new PhysicsInputError('INSUFFICIENT_DATA', 'Interpolation needs at least three stations.', { field: 'fieldsTesla', value: n });

  const coords = new Float64Array(2 * n);
  const logB = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    coords[2 * i] = xM[i] as number;
    coords[2 * i + 1] = yM[i] as number;
    logB[i] = Math.log10(fieldsTesla[i] as number);
  }
  const delaunay = new Delaunay(coords);
  // d3-delaunay jitters collinear input (and flags it), and fakes a triangle for 1–2 distinct points
  // (hull of fewer than three points): neither spans an area.
  const degenerate = delaunay.hull.length < 3 || delaunay.triangles.length < 3;
  if ((delaunay as { collinear?: unknown }).collinear || degenerate) {
    throw new PhysicsInputError('INSUFFICIENT_DATA', 'The stations lie on one line: they do not span an area to map.', {
      field: 'xM',
    });
  }
  const triangles = delaunay.triangles;
  const halfedges = delaunay.halfedges;
  const points = delaunay.points;
  const triangleCount = triangles.length / 3;

  const { width, height, cellSizeM, originXM, originYM } = grid;
  const cells = width * height;
  const out = new Float64Array(cells);
  const covered = new Uint8Array(cells);
  let coveredCount = 0;

  const EPS = -1e-12;
  let t = 0;
  let rowStart = 0;
  let la = 0;
  let lb = 0;
  let lc = 0;

  // Returns the triangle containing (px, py) with its barycentrics in la/lb/lc, or −1 (outside hull).
  const locate = (px: number, py: number, startT: number): number => {
    let cur = startT;
    for (let steps = 0; steps <= triangleCount + 3; steps++) {
      const a = triangles[3 * cur] as number;
      const b = triangles[3 * cur + 1] as number;
      const c = triangles[3 * cur + 2] as number;
      const xa = points[2 * a] as number;
      const ya = points[2 * a + 1] as number;
      const xb = points[2 * b] as number;
      const yb = points[2 * b + 1] as number;
      const xc = points[2 * c] as number;
      const yc = points[2 * c + 1] as number;
      const det = (yb - yc) * (xa - xc) + (xc - xb) * (ya - yc);
      la = ((yb - yc) * (px - xc) + (xc - xb) * (py - yc)) / det;
      lb = ((yc - ya) * (px - xc) + (xa - xc) * (py - yc)) / det;
      lc = 1 - la - lb;
      if (la >= EPS && lb >= EPS && lc >= EPS) {
        t = cur;
        return cur;
      }
      // Cross the edge opposite the most negative weight: a → edge b→c (3t+1), b → c→a (3t+2), c → a→b (3t).
      let e: number;
      if (la <= lb && la <= lc) e = 3 * cur + 1;
      else if (lb <= lc) e = 3 * cur + 2;
      else e = 3 * cur;
      const next = halfedges[e] as number;
      if (next < 0) {
        t = cur;
        return -1;
      }
      cur = (next / 3) | 0;
    }
    // Not reached for a Delaunay triangulation; fall back to a scan.
    for (let k = 0; k < triangleCount; k++) {
      const a = triangles[3 * k] as number;
      const b = triangles[3 * k + 1] as number;
      const c = triangles[3 * k + 2] as number;
      const xa = points[2 * a] as number;
      const ya = points[2 * a + 1] as number;
      const xb = points[2 * b] as number;
      const yb = points[2 * b + 1] as number;
      const xc = points[2 * c] as number;
      const yc = points[2 * c + 1] as number;
      const det = (yb - yc) * (xa - xc) + (xc - xb) * (ya - yc);
      la = ((yb - yc) * (px - xc) + (xc - xb) * (py - yc)) / det;
      lb = ((yc - ya) * (px - xc) + (xa - xc) * (py - yc)) / det;
      lc = 1 - la - lb;
      if (la >= EPS && lb >= EPS && lc >= EPS) return k;
    }
    return -1;
  };

  for (let j = 0; j < height; j++) {
    const py = originYM + (j + 0.5) * cellSizeM;
    t = rowStart;
    for (let i = 0; i < width; i++) {
      const px = originXM + (i + 0.5) * cellSizeM;
      const found = locate(px, py, t);
      const idx = j * width + i;
      if (i === 0) rowStart = t;
      if (found < 0) {
        out[idx] = NaN;
        continue;
      }
      out[idx] =
        la * (logB[triangles[3 * found] as number] as number) +
        lb * (logB[triangles[3 * found + 1] as number] as number) +
        lc * (logB[triangles[3 * found + 2] as number] as number);
      covered[idx] = 1;
      coveredCount++;
    }
  }
  return { originXM, originYM, cellSizeM, width, height, log10FieldTesla: out, covered, coveredCount };
}

/** A closed ring of [xM, yM] points (first point repeated at the end). */
export type RingM = Array<[number, number]>;

/** The isogauss contour at one level: polygons (outer ring then holes) enclosing |B| ≥ level, in metres. */
export interface IsogaussContour {
  readonly levelTesla: number;
  /** GeoJSON MultiPolygon-style coordinates in plan metres. */
  readonly polygons: RingM[][];
}

/**
 * Isogauss contours of an interpolated grid at the given levels (d3-contour marching squares on
 * log₁₀|B| with linear smoothing), converted to metres. Cells outside the stations' hull count as
 * below every level, so a contour that reaches the hull closes along it.
 */
export function isogaussContours(grid: FieldGrid, levelsTesla: readonly number[]): IsogaussContour[] {
  requireGridSpec(grid);
  if (grid.log10FieldTesla.length !== grid.width * grid.height) {
    throw new PhysicsInputError('LENGTH_MISMATCH', 'The grid values do not match its width × height.', {
      field: 'log10FieldTesla',
      value: grid.log10FieldTesla.length,
    });
  }
  if (levelsTesla.length === 0) throw new PhysicsInputError('INVALID_INPUT', 'Choose at least one contour level.', { field: 'levelsTesla' });
  levelsTesla.forEach((level, i) => requireFieldTesla(level, `levelsTesla[${i}]`));
  const generator = d3Contours().size([grid.width, grid.height]).smooth(true);
  const { originXM, originYM, cellSizeM } = grid;
  // d3-contour reads values[i] only; a Float64Array serves as the number array it expects.
  const values = grid.log10FieldTesla as unknown as number[];
  return levelsTesla.map((levelTesla) => {
    const multi = generator.contour(values, Math.log10(levelTesla));
    const polygons = multi.coordinates.map((polygon) =>
      polygon.map((ring) => ring.map((point) => [originXM + (point[0] as number) * cellSizeM, originYM + (point[1] as number) * cellSizeM] as [number, number])),
    );
    return { levelTesla, polygons };
  });
}

/** |B| in T of a covered grid cell (10^value); throws OUT_OF_RANGE for an uncovered or out-of-grid cell. */
export function gridCellFieldTesla(grid: FieldGrid, i: number, j: number): number {
  requireInteger(i, 'i', 0, grid.width - 1);
  requireInteger(j, 'j', 0, grid.height - 1);
  const idx = j * grid.width + i;
  if (grid.covered[idx] !== 1) {
    throw new PhysicsInputError('OUT_OF_RANGE', 'That grid cell lies outside the surveyed area (no stations around it).', {
      field: 'i',
      value: idx,
    });
  }
  return 10 ** (grid.log10FieldTesla[idx] as number);
}

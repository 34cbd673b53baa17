/**
 * Room outlines in plan metres: point-in-polygon, area, simplicity, and which room a station is in.
 * A polygon is a vertex list [[x, y], …], at least three vertices, not closed (first ≠ last).
 */

export type PolygonM = readonly (readonly [number, number])[];

/**
 * Crossing-number test (a horizontal ray from the point; W. R. Franklin's PNPOLY). A point exactly on an
 * edge counts as inside, so a station on a wall line belongs to a room rather than to none.
 */
export function pointInPolygon(xM: number, yM: number, polygon: PolygonM): boolean {
  const n = polygon.length;
  if (n < 3) return false;
  let inside = false;
  for (let i = 0, j = n - 1; i < n; j = i, i += 1) {
    const [xi, yi] = polygon[i]!;
    const [xj, yj] = polygon[j]!;
    if (onSegment(xM, yM, xi, yi, xj, yj)) return true;
    if (yi > yM !== yj > yM && xM < ((xj - xi) * (yM - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

const EPS_M = 1e-9;

function onSegment(px: number, py: number, ax: number, ay: number, bx: number, by: number): boolean {
  const cross = (bx - ax) * (py - ay) - (by - ay) * (px - ax);
  const scale = Math.max(1, Math.hypot(bx - ax, by - ay));
  if (Math.abs(cross) > EPS_M * scale) return false;
  return px >= Math.min(ax, bx) - EPS_M && px <= Math.max(ax, bx) + EPS_M && py >= Math.min(ay, by) - EPS_M && py <= Math.max(ay, by) + EPS_M;
}

/** Area by the shoelace formula, m² (always ≥ 0, whatever the winding). */
export function polygonAreaM2(polygon: PolygonM): number {
  let twice = 0;
  for (let i = 0, j = polygon.length - 1; i < polygon.length; j = i, i += 1) {
    const [xi, yi] = polygon[i]!;
    const [xj, yj] = polygon[j]!;
    twice += xj * yi - xi * yj;
  }
  return Math.abs(twice) / 2;
}

function segmentsCross(a: readonly [number, number], b: readonly [number, number], c: readonly [number, number], d: readonly [number, number]): boolean {
  const orient = (p: readonly [number, number], q: readonly [number, number], r: readonly [number, number]) => Math.sign((q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]));
  const o1 = orient(a, b, c);
  const o2 = orient(a, b, d);
  const o3 = orient(c, d, a);
  const o4 = orient(c, d, b);
  if (o1 !== o2 && o3 !== o4) return true;
  const within = (p: readonly [number, number], q: readonly [number, number], r: readonly [number, number]) =>
    r[0] >= Math.min(p[0], q[0]) && r[0] <= Math.max(p[0], q[0]) && r[1] >= Math.min(p[1], q[1]) && r[1] <= Math.max(p[1], q[1]);
  return (o1 === 0 && within(a, b, c)) || (o2 === 0 && within(a, b, d)) || (o3 === 0 && within(c, d, a)) || (o4 === 0 && within(c, d, b));
}

/** True when no two non-adjacent edges touch or cross (a room outline must not fold over itself). */
export function isSimplePolygon(polygon: PolygonM): boolean {
  const n = polygon.length;
  if (n < 3) return false;
  for (let i = 0; i < n; i += 1) {
    for (let j = i + 1; j < n; j += 1) {
      // Adjacent edges share a vertex by construction.
      if (j === i + 1 || (i === 0 && j === n - 1)) continue;
      if (segmentsCross(polygon[i]!, polygon[(i + 1) % n]!, polygon[j]!, polygon[(j + 1) % n]!)) return false;
    }
  }
  return true;
}

export interface RoomOutline {
  id: string;
  polygon: PolygonM;
}

/**
 * The room that contains (x, y), or null. Where outlines overlap (a store room drawn inside a hall) the
 * smallest room wins, then the smaller id, so the answer never depends on list order.
 */
export function roomForPoint<R extends RoomOutline>(rooms: readonly R[], xM: number, yM: number): R | null {
  let best: { room: R; area: number } | null = null;
  for (const room of rooms) {
    if (!pointInPolygon(xM, yM, room.polygon)) continue;
    const area = polygonAreaM2(room.polygon);
    if (!best || area < best.area || (area === best.area && room.id < best.room.id)) best = { room, area };
  }
  return best?.room ?? null;
}

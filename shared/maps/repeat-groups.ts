/**
 * Repeat-reading groups for a survey map, exactly as shared/physics/repeats.ts forms them (single
 * linkage within the radius, 3-D), but fast for surveys where most readings share a spot: readings at
 * the same point collapse to one, the points are linked on a numeric hash grid, and each linked set is
 * summarised as repeats.ts does: mean, sample standard deviation (n − 1), range, and the largest
 * pairwise Eₙ = |Bᵢ − Bⱼ|/√(Uᵢ² + Uⱼ²) (ISO 13528; recalled) by the physics module's enNumber, pairs
 * taken in input order. Identical points are always within the radius of one another, so linking points
 * links exactly the readings groupRepeatReadings would link; repeat-groups.test.ts checks the two agree.
 * Inputs are trusted (the server's own rows): no validation here.
 */
import { enNumber, type RepeatGroup, type RepeatReading } from '../physics';

const OFFSET = 2 ** 20;
const SPAN = 2 ** 21;
const clampCell = (c: number) => Math.min(OFFSET - 1, Math.max(-OFFSET, c));
const clampZ = (c: number) => Math.min(31, Math.max(-32, c));
/** A numeric key for a grid cell (x, y within ±2²⁰ cells, z within ±32; clamping only widens a cell). */
const cellKey = (cx: number, cy: number, cz: number) => ((clampCell(cx) + OFFSET) * SPAN + (clampCell(cy) + OFFSET)) * 64 + (clampZ(cz) + 32);

/** Groups of two or more readings (same result as groupRepeatReadings with includeSingles false, in another order). */
export function groupRepeatsFast(readings: readonly RepeatReading[], radiusM: number): RepeatGroup[] {
  // Collapse readings at one point (nested maps on the coordinates themselves: no number-to-text).
  const pointOf = new Map<number, Map<number, Map<number, number>>>();
  const px: number[] = [];
  const py: number[] = [];
  const pz: number[] = [];
  const members: number[][] = [];
  readings.forEach((r, i) => {
    const z = r.zM ?? 0;
    let byY = pointOf.get(r.xM);
    if (!byY) pointOf.set(r.xM, (byY = new Map()));
    let byZ = byY.get(r.yM);
    if (!byZ) byY.set(r.yM, (byZ = new Map()));
    let p = byZ.get(z);
    if (p === undefined) {
      p = px.length;
      byZ.set(z, p);
      px.push(r.xM);
      py.push(r.yM);
      pz.push(z);
      members.push([]);
    }
    members[p]!.push(i);
  });
  const n = px.length;
  const parent = Int32Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]!]!;
      i = parent[i]!;
    }
    return i;
  };
  const cells = new Map<number, number[]>();
  const cellOf = (i: number) => [Math.floor(px[i]! / radiusM), Math.floor(py[i]! / radiusM), Math.floor(pz[i]! / radiusM)] as const;
  for (let i = 0; i < n; i++) {
    const [cx, cy, cz] = cellOf(i);
    const key = cellKey(cx, cy, cz);
    const list = cells.get(key);
    if (list) list.push(i);
    else cells.set(key, [i]);
  }
  const r2 = radiusM * radiusM;
  for (let i = 0; i < n; i++) {
    const [cx, cy, cz] = cellOf(i);
    for (let dx = -1; dx <= 1; dx++)
      for (let dy = -1; dy <= 1; dy++)
        for (let dz = -1; dz <= 1; dz++) {
          const list = cells.get(cellKey(cx + dx, cy + dy, cz + dz));
          if (!list) continue;
          for (const j of list) {
            if (j <= i) continue;
            const d2 = (px[j]! - px[i]!) ** 2 + (py[j]! - py[i]!) ** 2 + (pz[j]! - pz[i]!) ** 2;
            if (d2 <= r2) {
              const a = find(i);
              const b = find(j);
              if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
            }
          }
        }
  }
  const sets = new Map<number, number[]>();
  for (let p = 0; p < n; p++) {
    const root = find(p);
    const list = sets.get(root);
    if (list) list.push(...members[p]!);
    else sets.set(root, [...members[p]!]);
  }
  const groups: RepeatGroup[] = [];
  const uncertainty = (r: RepeatReading) => r.expandedUncertaintyTesla ?? (r.relativeExpandedUncertainty ?? 0) * r.fieldTesla;
  for (const list of sets.values()) {
    if (list.length < 2) continue;
    list.sort((a, b) => a - b);
    let sum = 0;
    let min = Infinity;
    let max = -Infinity;
    for (const i of list) {
      const b = readings[i]!.fieldTesla;
      sum += b;
      if (b < min) min = b;
      if (b > max) max = b;
    }
    const mean = sum / list.length;
    let ss = 0;
    for (const i of list) ss += (readings[i]!.fieldTesla - mean) ** 2;
    let maxEn = 0;
    let worstPair: [string, string] | null = null;
    for (let a = 0; a < list.length; a++)
      for (let b = a + 1; b < list.length; b++) {
        const ra = readings[list[a]!]!;
        const rb = readings[list[b]!]!;
        const en = enNumber(ra.fieldTesla, rb.fieldTesla, uncertainty(ra), uncertainty(rb));
        if (worstPair === null || en > maxEn) {
          maxEn = en;
          worstPair = [ra.id, rb.id];
        }
      }
    groups.push({
      readingIds: list.map((i) => readings[i]!.id),
      count: list.length,
      meanTesla: mean,
      spreadTesla: Math.sqrt(ss / (list.length - 1)),
      minTesla: min,
      maxTesla: max,
      maxEn,
      worstPair,
      disagree: maxEn > 1,
    });
  }
  return groups;
}

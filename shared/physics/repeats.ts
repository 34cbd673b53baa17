/**
 * Repeat readings: readings whose stations lie within a radius of each other are grouped (single
 * linkage: A–B and B–C within the radius put A, B, C in one group), then summarised.
 *
 * Disagreement uses the Eₙ number of proficiency testing (ISO 13528 and ISO/IEC 17043; recalled):
 *   Eₙ = |Bᵢ − Bⱼ| / √(Uᵢ² + Uⱼ²)        with Uᵢ the EXPANDED uncertainty (coverage k = 2, as printed on
 * calibration certificates); |Eₙ| > 1 means the two readings disagree beyond their combined
 * uncertainty. A group disagrees when any pair does. Spread is the sample standard deviation (n − 1).
 */

import { PhysicsInputError, requireFinite, requireInRange, requireNonNegative, requirePositive } from './errors';
import { requireFieldTesla } from './kinematics';

/** One field reading at a station. Give exactly one of the two uncertainty forms. */
export interface RepeatReading {
  readonly id: string;
  readonly xM: number;
  readonly yM: number;
  /** Height, m (default 0). */
  readonly zM?: number;
  readonly fieldTesla: number;
  /** Expanded (k = 2) uncertainty in T. */
  readonly expandedUncertaintyTesla?: number;
  /** Expanded (k = 2) uncertainty relative to the reading, e.g. 0.02. */
  readonly relativeExpandedUncertainty?: number;
}

/** A group of readings within the radius of one another. */
export interface RepeatGroup {
  readonly readingIds: string[];
  readonly count: number;
  readonly meanTesla: number;
  /** Sample standard deviation (n − 1); 0 for a single reading. */
  readonly spreadTesla: number;
  readonly minTesla: number;
  readonly maxTesla: number;
  /** Largest pairwise Eₙ in the group (0 for a single reading). */
  readonly maxEn: number;
  /** The pair with the largest Eₙ, or null. */
  readonly worstPair: readonly [string, string] | null;
  /** True when some pair has Eₙ > 1. */
  readonly disagree: boolean;
}

/** Options of {@link groupRepeatReadings}. */
export interface RepeatOptions {
  /** Grouping radius, m (> 0). */
  readonly radiusM: number;
  /** Include groups of one reading (default false). */
  readonly includeSingles?: boolean;
}

function expandedUncertainty(r: RepeatReading, index: number): number {
  const hasAbs = r.expandedUncertaintyTesla !== undefined;
  const hasRel = r.relativeExpandedUncertainty !== undefined;
  if (hasAbs === hasRel) {
    throw new PhysicsInputError(
      'INVALID_INPUT',
      'Give each reading one uncertainty: either in tesla or relative to the reading.',
      { field: `readings[${index}].expandedUncertaintyTesla` },
    );
  }
  if (hasAbs) return requireNonNegative(r.expandedUncertaintyTesla as number, `readings[${index}].expandedUncertaintyTesla`);
  const rel = requireInRange(r.relativeExpandedUncertainty as number, `readings[${index}].relativeExpandedUncertainty`, 0, 1);
  return rel * r.fieldTesla;
}

/** Eₙ = |a − b|/√(Uₐ² + U_b²) (ISO 13528; recalled). Both uncertainties zero: Infinity if a ≠ b, else 0. */
export function enNumber(aTesla: number, bTesla: number, expandedUncertaintyATesla: number, expandedUncertaintyBTesla: number): number {
  requireFinite(aTesla, 'aTesla');
  requireFinite(bTesla, 'bTesla');
  requireNonNegative(expandedUncertaintyATesla, 'expandedUncertaintyATesla');
  requireNonNegative(expandedUncertaintyBTesla, 'expandedUncertaintyBTesla');
  const combined = Math.hypot(expandedUncertaintyATesla, expandedUncertaintyBTesla);
  const diff = Math.abs(aTesla - bTesla);
  if (combined === 0) return diff === 0 ? 0 : Infinity;
  return diff / combined;
}

/**
 * Groups readings whose stations lie within `radiusM` (single linkage, 3-D distance with z default 0;
 * a hash grid of radius-sized cells keeps it near-linear), and summarises each group: mean, spread,
 * range and the largest pairwise Eₙ. Groups are ordered by their first reading's input position.
 */
export function groupRepeatReadings(readings: readonly RepeatReading[], options: RepeatOptions): RepeatGroup[] {
  const radius = requirePositive(options.radiusM, 'radiusM');
  const n = readings.length;
  const u = new Float64Array(n);
  readings.forEach((r, i) => {
    requireFinite(r.xM, `readings[${i}].xM`);
    requireFinite(r.yM, `readings[${i}].yM`);
    requireFinite(r.zM ?? 0, `readings[${i}].zM`);
    requireFieldTesla(r.fieldTesla, `readings[${i}].fieldTesla`);
    u[i] = expandedUncertainty(r, i);
  });

  const parent = Int32Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i] as number] as number;
      i = parent[i] as number;
    }
    return i;
  };
  const union = (a: number, b: number): void => {
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
  };

  const cellKey = (cx: number, cy: number, cz: number): string => `${cx},${cy},${cz}`;
  const cells = new Map<string, number[]>();
  readings.forEach((r, i) => {
    const key = cellKey(Math.floor(r.xM / radius), Math.floor(r.yM / radius), Math.floor((r.zM ?? 0) / radius));
    const list = cells.get(key);
    if (list) list.push(i);
    else cells.set(key, [i]);
  });
  const r2 = radius * radius;
  readings.forEach((r, i) => {
    const cx = Math.floor(r.xM / radius);
    const cy = Math.floor(r.yM / radius);
    const cz = Math.floor((r.zM ?? 0) / radius);
    for (let dx = -1; dx <= 1; dx++)
      for (let dy = -1; dy <= 1; dy++)
        for (let dz = -1; dz <= 1; dz++) {
          const list = cells.get(cellKey(cx + dx, cy + dy, cz + dz));
          if (!list) continue;
          for (const j of list) {
            if (j <= i) continue;
            const o = readings[j] as RepeatReading;
            const d2 = (o.xM - r.xM) ** 2 + (o.yM - r.yM) ** 2 + ((o.zM ?? 0) - (r.zM ?? 0)) ** 2;
            if (d2 <= r2) union(i, j);
          }
        }
  });

  const members = new Map<number, number[]>();
  for (let i = 0; i < n; i++) {
    const root = find(i);
    const list = members.get(root);
    if (list) list.push(i);
    else members.set(root, [i]);
  }

  const groups: RepeatGroup[] = [];
  for (const list of members.values()) {
    if (list.length < 2 && !options.includeSingles) continue;
    let sum = 0;
    let min = Infinity;
    let max = -Infinity;
    for (const i of list) {
      const b = (readings[i] as RepeatReading).fieldTesla;
      sum += b;
      if (b < min) min = b;
      if (b > max) max = b;
    }
    const mean = sum / list.length;
    let ss = 0;
    for (const i of list) ss += ((readings[i] as RepeatReading).fieldTesla - mean) ** 2;
    let maxEn = 0;
    let worstPair: [string, string] | null = null;
    for (let a = 0; a < list.length; a++)
      for (let b = a + 1; b < list.length; b++) {
        const ia = list[a] as number;
        const ib = list[b] as number;
        const ra = readings[ia] as RepeatReading;
        const rb = readings[ib] as RepeatReading;
        const en = enNumber(ra.fieldTesla, rb.fieldTesla, u[ia] as number, u[ib] as number);
        if (worstPair === null || en > maxEn) {
          maxEn = en;
          worstPair = [ra.id, rb.id];
        }
      }
    groups.push({
      readingIds: list.map((i) => (readings[i] as RepeatReading).id),
      count: list.length,
      meanTesla: mean,
      spreadTesla: list.length > 1 ? Math.sqrt(ss / (list.length - 1)) : 0,
      minTesla: min,
      maxTesla: max,
      maxEn,
      worstPair,
      disagree: maxEn > 1,
    });
  }
  return groups;
}

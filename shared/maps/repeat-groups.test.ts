/**
 * The map's fast repeat grouping against shared/physics/repeats.ts, the module it must agree with
 * (whose Eₙ and spread are checked there against ISO 13528 and the sample standard deviation): same
 * groups, same numbers, on invented readings with shared spots, near neighbours and chains.
 */
import { describe, expect, it } from 'vitest';
import { groupRepeatReadings, type RepeatGroup, type RepeatReading } from '../physics';
import { mulberry32 } from '../random/mulberry32';
import { groupRepeatsFast } from './repeat-groups';

function invented(seed: number, spots: number): RepeatReading[] {
  const rand = mulberry32(seed);
  const out: RepeatReading[] = [];
  for (let s = 0; s < spots; s++) {
    const x = rand() * 20;
    const y = rand() * 20;
    const z = rand() < 0.2 ? 1.5 : 1;
    const copies = 1 + Math.floor(rand() * 4);
    for (let c = 0; c < copies; c++) {
      // most repeats on the very spot, some a few centimetres off (still within 0.3 m), some far
      const jitter = rand() < 0.3 ? 0.1 : 0;
      out.push({ id: `r${out.length}`, xM: x + jitter * rand(), yM: y + jitter * rand(), zM: z, fieldTesla: 1e-3 * (1 + 0.05 * rand()), relativeExpandedUncertainty: 0.04 });
    }
  }
  return out;
}

const key = (g: RepeatGroup) => [...g.readingIds].sort().join(',');

describe('fast repeat grouping', () => {
  it.each([1, 2, 3])('finds the same groups with the same numbers as the physics module (seed %i)', (seed) => {
    const readings = invented(seed, 1500);
    const slow = new Map(groupRepeatReadings(readings, { radiusM: 0.3 }).map((g) => [key(g), g]));
    const fast = groupRepeatsFast(readings, 0.3);
    expect(fast.length).toBe(slow.size);
    expect(fast.length).toBeGreaterThan(100);
    for (const g of fast) {
      const s = slow.get(key(g));
      expect(s, key(g)).toBeDefined();
      expect(g.count).toBe(s!.count);
      expect(g.meanTesla).toBeCloseTo(s!.meanTesla, 15);
      expect(g.spreadTesla).toBeCloseTo(s!.spreadTesla, 15);
      expect(g.maxEn).toBeCloseTo(s!.maxEn, 12);
      expect(g.disagree).toBe(s!.disagree);
    }
  });

  it('links chains (A–B and B–C within the radius, A–C not) into one group', () => {
    const r = (id: string, x: number): RepeatReading => ({ id, xM: x, yM: 0, zM: 1, fieldTesla: 1e-3, relativeExpandedUncertainty: 0.04 });
    const groups = groupRepeatsFast([r('a', 0), r('b', 0.25), r('c', 0.5), r('d', 5)], 0.3);
    expect(groups.map(key)).toEqual(['a,b,c']);
  });
});

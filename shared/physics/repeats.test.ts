import { describe, expect, it } from 'vitest';
import { PhysicsInputError } from './errors';
import { enNumber, groupRepeatReadings, type RepeatReading } from './repeats';

// Eₙ = |x − y|/√(U_x² + U_y²), |Eₙ| > 1 unsatisfactory: ISO 13528 / ISO/IEC 17043 (recalled).
describe('repeat readings', () => {
  it('Eₙ follows the ISO 13528 definition', () => {
    expect(enNumber(1.0e-3, 1.05e-3, 0.03e-3, 0.04e-3)).toBeCloseTo(0.05 / 0.05, 12);
    expect(enNumber(1, 1, 0, 0)).toBe(0);
    expect(enNumber(1, 2, 0, 0)).toBe(Infinity);
  });

  const readings: RepeatReading[] = [
    { id: 'a1', xM: 0, yM: 0, fieldTesla: 1.0e-3, relativeExpandedUncertainty: 0.02 },
    { id: 'a2', xM: 0.2, yM: 0, fieldTesla: 1.01e-3, relativeExpandedUncertainty: 0.02 },
    { id: 'a3', xM: 0.4, yM: 0.1, fieldTesla: 1.02e-3, expandedUncertaintyTesla: 0.02e-3 }, // chained via a2
    { id: 'b1', xM: 5, yM: 5, fieldTesla: 0.5e-3, expandedUncertaintyTesla: 0.005e-3 },
    { id: 'b2', xM: 5, yM: 5.1, fieldTesla: 0.6e-3, expandedUncertaintyTesla: 0.005e-3 },
    { id: 'c1', xM: 20, yM: 0, fieldTesla: 0.1e-3, expandedUncertaintyTesla: 0.01e-3 },
  ];

  it('groups stations within the radius by single linkage, and summarises each group', () => {
    const groups = groupRepeatReadings(readings, { radiusM: 0.25 });
    expect(groups.map((g) => g.readingIds)).toEqual([
      ['a1', 'a2', 'a3'],
      ['b1', 'b2'],
    ]);
    const [a, b] = groups;
    expect(a?.meanTesla).toBeCloseTo(1.01e-3, 15);
    expect(a?.spreadTesla).toBeCloseTo(0.01e-3, 15); // sample standard deviation of 1.00, 1.01, 1.02
    expect(a?.disagree).toBe(false);
    expect(b?.disagree).toBe(true);
    expect(b?.maxEn).toBeCloseTo(0.1e-3 / Math.hypot(0.005e-3, 0.005e-3), 9);
    expect(b?.worstPair).toEqual(['b1', 'b2']);
  });

  it('can include single readings and uses height when given', () => {
    const groups = groupRepeatReadings(readings, { radiusM: 0.25, includeSingles: true });
    expect(groups).toHaveLength(3);
    const stacked = groupRepeatReadings(
      [
        { id: 'low', xM: 0, yM: 0, zM: 0, fieldTesla: 1e-3, expandedUncertaintyTesla: 1e-5 },
        { id: 'high', xM: 0, yM: 0, zM: 1.5, fieldTesla: 1e-3, expandedUncertaintyTesla: 1e-5 },
      ],
      { radiusM: 0.5 },
    );
    expect(stacked).toHaveLength(0);
  });

  it('refuses bad readings and radii', () => {
    const one = (r: Partial<RepeatReading>) => [{ id: 'x', xM: 0, yM: 0, fieldTesla: 1e-3, expandedUncertaintyTesla: 1e-5, ...r }] as RepeatReading[];
    for (const bad of [0, -1e-3, NaN, Infinity, -Infinity]) {
      expect(() => groupRepeatReadings(one({ fieldTesla: bad }), { radiusM: 1 })).toThrow(PhysicsInputError);
      expect(() => groupRepeatReadings(one({}), { radiusM: bad })).toThrow(PhysicsInputError);
    }
    expect(() => groupRepeatReadings(one({ xM: NaN }), { radiusM: 1 })).toThrow(PhysicsInputError);
    expect(() => groupRepeatReadings(one({ expandedUncertaintyTesla: -1 }), { radiusM: 1 })).toThrow(PhysicsInputError);
    expect(() => groupRepeatReadings(one({ relativeExpandedUncertainty: 0.1 }), { radiusM: 1 })).toThrow(expect.objectContaining({ code: 'INVALID_INPUT' }));
    expect(() => enNumber(NaN, 1, 1, 1)).toThrow(PhysicsInputError);
    expect(() => enNumber(1, 1, -1, 1)).toThrow(PhysicsInputError);
  });
});

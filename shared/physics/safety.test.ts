import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PhysicsInputError } from './errors';
import {
  classifyField,
  createZoneSet,
  DEFAULT_ZONE_SETS,
  EQUIPMENT_DISTURBANCE_ZONE_SET,
  EU_2013_35_ZONE_SET,
  GENERAL_SAFETY_CAUTIONS,
  ICNIRP_2009_ZONE_SET,
  IEC_60601_2_33_ED3_ZONE_SET,
  IEC_60601_2_33_ED4_ZONE_SET,
} from './safety';

const thresholds = (set: { thresholds: readonly { thresholdTesla: number }[] }) => set.thresholds.map((t) => t.thresholdTesla);

// All values below are RECALLED (see ../shared/REFERENCES.md): whoever can read the primary texts should confirm them.
describe('default zone sets carry the published thresholds', () => {
  it('EU directive 2013/35/EU, Annex II (recalled): 0.5 mT, 3 mT action levels; 2 T, 8 T limit values', () => {
    expect(thresholds(EU_2013_35_ZONE_SET)).toEqual([0.5e-3, 3e-3, 2, 8]);
  });

  it('ICNIRP 2009, Health Physics 96(4):504–514 (recalled): implants 0.5 mT, public 400 mT, occupational 2 T and 8 T', () => {
    expect(thresholds(ICNIRP_2009_ZONE_SET)).toEqual([0.5e-3, 0.4, 2, 8]);
  });

  it('IEC 60601-2-33 (recalled): 0.5 mT up to the 2015 edition, 0.9 mT from edition 4 (2022), each naming its edition', () => {
    expect(thresholds(IEC_60601_2_33_ED3_ZONE_SET)).toEqual([0.5e-3]);
    expect(thresholds(IEC_60601_2_33_ED4_ZONE_SET)).toEqual([0.9e-3]);
    expect(IEC_60601_2_33_ED3_ZONE_SET.follows).toMatch(/2015/);
    expect(IEC_60601_2_33_ED4_ZONE_SET.follows).toMatch(/edition 4 \(2022\)/);
  });

  it('equipment disturbance, Prudent Practices in the Laboratory (2011) table 7.1 (common practice, recalled): 0.1 mT and 1 mT', () => {
    expect(thresholds(EQUIPMENT_DISTURBANCE_ZONE_SET)).toEqual([0.1e-3, 1e-3]);
  });

  it('every default threshold has a source, a caution and is marked recalled', () => {
    for (const set of DEFAULT_ZONE_SETS) {
      expect(set.follows.length).toBeGreaterThan(5);
      for (const t of set.thresholds) {
        expect(t.source.length).toBeGreaterThan(10);
        expect(t.caution.length).toBeGreaterThan(10);
        expect(t.recalled).toBe(true);
      }
      expect(() => createZoneSet(set)).not.toThrow();
    }
  });
});

describe('classification', () => {
  it('0.7 mT is inside the ed. 3 controlled-access area but outside the ed. 4 hazard area (the editions differ)', () => {
    expect(classifyField(0.7e-3, IEC_60601_2_33_ED3_ZONE_SET).threshold?.id).toBe('iec-ed3-controlled-access');
    expect(classifyField(0.7e-3, IEC_60601_2_33_ED4_ZONE_SET).threshold).toBeNull();
  });

  it('a field exactly at a threshold is inside that zone (conservative boundary)', () => {
    expect(classifyField(3e-3, EU_2013_35_ZONE_SET).threshold?.id).toBe('eu-al-projectile');
    const below = classifyField(0.2e-3, EU_2013_35_ZONE_SET);
    expect(below).toMatchObject({ zoneIndex: -1, label: EU_2013_35_ZONE_SET.belowLabel });
    expect(below.fractionOfNext).toBeCloseTo(0.4, 12);
  });

  it('always returns the general cautions, and the zone caution first', () => {
    const result = classifyField(2.5, EU_2013_35_ZONE_SET);
    expect(result.cautions[0]).toBe(EU_2013_35_ZONE_SET.thresholds[2]?.caution);
    expect(result.cautions.slice(1)).toEqual(GENERAL_SAFETY_CAUTIONS);
    expect(result.nextThreshold?.thresholdTesla).toBe(8);
  });

  it('the zone index never decreases as the field grows (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 20, noNaN: true }), fc.double({ min: 1e-9, max: 20, noNaN: true }), (a, b) => {
        const lo = classifyField(Math.min(a, b), EU_2013_35_ZONE_SET).zoneIndex;
        const hi = classifyField(Math.max(a, b), EU_2013_35_ZONE_SET).zoneIndex;
        return lo <= hi;
      }),
    );
  });

  it('a site can configure its own zone set', () => {
    const site = createZoneSet({
      id: 'site',
      name: 'Harrowby site rules',
      follows: 'Local rules 2026 (invented demo)',
      belowLabel: 'Unrestricted',
      thresholds: [
        { id: 'a', label: 'Screened', thresholdTesla: 0.3e-3, source: 'Local rule 4.1 (invented)', caution: 'Screen everyone.', recalled: false },
        { id: 'b', label: 'Escorted', thresholdTesla: 3e-3, source: 'Local rule 4.2 (invented)', caution: 'Escort only.', recalled: false },
      ],
    });
    expect(classifyField(1e-3, site).label).toBe('Screened');
  });
});

describe('safety input errors', () => {
  it.each([0, -1e-3, NaN, Infinity, -Infinity])('field %s is refused', (bad) => {
    expect(() => classifyField(bad, EU_2013_35_ZONE_SET)).toThrow(PhysicsInputError);
  });

  it.each([
    ['descending thresholds', [0.003, 0.0005]],
    ['equal thresholds', [0.001, 0.001]],
    ['a NaN threshold', [NaN]],
    ['a negative threshold', [-1]],
    ['no thresholds', []],
  ])('a zone set with %s is refused', (_name, values) => {
    const set = {
      id: 'x',
      name: 'x',
      follows: 'x',
      belowLabel: 'x',
      thresholds: values.map((v, i) => ({ id: `t${i}`, label: 'l', thresholdTesla: v, source: 's', caution: 'c', recalled: false })),
    };
    expect(() => createZoneSet(set)).toThrow(expect.objectContaining({ code: 'INVALID_INPUT' }));
    expect(() => classifyField(1e-3, set)).toThrow(PhysicsInputError);
  });

  it('a zone set without a source or edition is refused', () => {
    const set = { ...EU_2013_35_ZONE_SET, follows: '' };
    expect(() => createZoneSet(set)).toThrow(/edition/);
  });
});

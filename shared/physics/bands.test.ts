import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bandOverlap, findLineBandHits, findStationBandHits, type WatchBand } from './bands';
import { PhysicsInputError } from './errors';
import { cyclotronFrequencyHz, lineBandHz } from './lines';

// ITU Radio Regulations (2020), Article 5: RR 5.340 radio-astronomy band 1400–1427 MHz (H I line 1420.406 MHz),
// ISM 2400–2500 MHz (RR 5.150), GPS L1 1575.42 MHz (IS-GPS-200). Recalled list per REFERENCES.md.
const WATCH: WatchBand[] = [
  { id: 'ra-hi', name: 'Radio astronomy H I (RR 5.340)', lowHz: 1400e6, highHz: 1427e6 },
  { id: 'ism-2g4', name: 'ISM 2.4 GHz (RR 5.150)', lowHz: 2400e6, highHz: 2500e6 },
  { id: 'gps-l1', name: 'GPS L1 ±1.023 MHz', lowHz: 1575.42e6 - 1.023e6, highHz: 1575.42e6 + 1.023e6 },
];

describe('watch-band overlap', () => {
  it('electrons in 50.74 mT radiate the H I line: 1420.406 MHz / 27.9925 GHz/T (CODATA) inside RR 5.340', () => {
    const fieldTesla = 1420.406e6 / 27.99249e9;
    const line = lineBandHz({ species: 'electron', harmonic: 1, fieldMinTesla: fieldTesla, fieldMaxTesla: fieldTesla, relativeUncertainty: 0.01 });
    const hits = findLineBandHits([{ ...line, speciesId: 'electron', harmonic: 1 }], WATCH);
    expect(hits.map((h) => h.watchBandId)).toEqual(['ra-hi']);
    expect(hits[0]?.overlapHz).toBeCloseTo(1427e6 - line.lowHz, 0);
  });

  it('a margin turns a near miss into a hit with zero overlap and the gap reported', () => {
    const line = { lowHz: 2501e6, highHz: 2502e6 };
    const band = { lowHz: 2400e6, highHz: 2500e6 };
    expect(bandOverlap(line, band).hit).toBe(false);
    const withMargin = bandOverlap(line, band, 2e6);
    expect(withMargin).toMatchObject({ hit: true, overlapHz: 0, gapHz: 1e6 });
  });

  it('a zero-width line on a band edge is a hit (closed intervals)', () => {
    expect(bandOverlap({ lowHz: 1400e6, highHz: 1400e6 }, { lowHz: 1400e6, highHz: 1427e6 })).toMatchObject({ hit: true, lineFractionInside: 1 });
  });

  const interval = fc.tuple(fc.double({ min: 0, max: 1e10, noNaN: true }), fc.double({ min: 0, max: 1e10, noNaN: true })).map(([a, b]) => ({
    lowHz: Math.min(a, b),
    highHz: Math.max(a, b),
  }));

  it('interval logic: overlap is symmetric, never exceeds either width, and hit ⇔ the intervals share a point (property)', () => {
    fc.assert(
      fc.property(interval, interval, (a, b) => {
        const ab = bandOverlap(a, b);
        const ba = bandOverlap(b, a);
        const share = Math.max(a.lowHz, b.lowHz) <= Math.min(a.highHz, b.highHz);
        return (
          ab.overlapHz === ba.overlapHz &&
          ab.gapHz === ba.gapHz &&
          ab.overlapHz <= a.highHz - a.lowHz &&
          ab.overlapHz <= b.highHz - b.lowHz &&
          ab.hit === share &&
          (ab.overlapHz === 0 || ab.gapHz === 0)
        );
      }),
    );
  });

  it('interval logic: a larger margin never loses a hit (property)', () => {
    fc.assert(
      fc.property(interval, interval, fc.double({ min: 0, max: 1e9, noNaN: true }), fc.double({ min: 0, max: 1e9, noNaN: true }), (a, b, m1, m2) => {
        const small = bandOverlap(a, b, Math.min(m1, m2));
        const large = bandOverlap(a, b, Math.max(m1, m2));
        return !small.hit || large.hit;
      }),
    );
  });

  it('the bulk search finds exactly the pairs a brute-force scan finds (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 1e-5, max: 0.2, noNaN: true }), { minLength: 1, maxLength: 30 }),
        fc.array(interval, { minLength: 0, maxLength: 12 }).map((list) => list.map((b, i): WatchBand => ({ ...b, id: `b${i}` }))),
        fc.double({ min: 0, max: 0.1, noNaN: true }),
        fc.double({ min: 0, max: 5e7, noNaN: true }),
        (fields, bands, u, marginHz) => {
          const species = ['electron', 'proton'] as const;
          const harmonicCount = 3;
          const result = findStationBandHits({
            fieldsTesla: Float64Array.from(fields),
            relativeUncertainty: u,
            species,
            harmonicCount,
            watchBands: bands,
            marginHz,
          });
          const expected = new Set<string>();
          fields.forEach((b, i) =>
            species.forEach((s, si) => {
              for (let n = 1; n <= harmonicCount; n++) {
                const f = n * cyclotronFrequencyHz(s, b);
                bands.forEach((band, bi) => {
                  if (Math.max(f * (1 - u), band.lowHz - marginHz) <= Math.min(f * (1 + u), band.highHz + marginHz)) expected.add(`${i}/${si}/${n}/${bi}`);
                });
              }
            }),
          );
          const got = new Set<string>();
          for (let k = 0; k < result.count; k++) got.add(`${result.stationIndex[k]}/${result.speciesIndex[k]}/${result.harmonic[k]}/${result.watchBandIndex[k]}`);
          // lines exactly on an edge may differ by rounding of n·k·B(1±u) in the last bit; compare without those
          const edge = (key: string): boolean => {
            const [i, si, n, bi] = key.split('/').map(Number) as [number, number, number, number];
            const f = n * cyclotronFrequencyHz(species[si] as 'electron', fields[i] as number);
            const band = bands[bi] as WatchBand;
            const close = (x: number, y: number) => Math.abs(x - y) <= 1e-9 * Math.max(1, Math.abs(y));
            return close(f * (1 + u), band.lowHz - marginHz) || close(f * (1 - u), band.highHz + marginHz);
          };
          const a = [...got].filter((k) => !edge(k)).sort();
          const b = [...expected].filter((k) => !edge(k)).sort();
          return result.linesExamined === fields.length * 2 * harmonicCount && JSON.stringify(a) === JSON.stringify(b);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('the bulk search labels each hit with its species, harmonic and band', () => {
    const fieldTesla = 2450e6 / 2 / 27.99249e9; // 2nd electron harmonic at 2.45 GHz
    const result = findStationBandHits({
      fieldsTesla: Float64Array.from([fieldTesla]),
      relativeUncertainty: 0.001,
      species: ['electron', { species: 'proton', kineticEnergyJ: 0 }],
      harmonicCount: 3,
      watchBands: WATCH,
    });
    expect(result.count).toBe(1);
    expect([result.speciesIndex[0], result.harmonic[0], result.watchBandIndex[0]]).toEqual([0, 2, 1]);
    expect(result.overlapHz[0]).toBeCloseTo((result.lineHighHz[0] as number) - (result.lineLowHz[0] as number), 0);
  });
});

describe('band input errors', () => {
  it('refuses NaN, infinite, negative and inverted bands, and negative margins', () => {
    const good = { lowHz: 1, highHz: 2 };
    for (const bad of [{ lowHz: NaN, highHz: 1 }, { lowHz: 0, highHz: Infinity }, { lowHz: -1, highHz: 1 }, { lowHz: 2, highHz: 1 }]) {
      expect(() => bandOverlap(bad, good)).toThrow(PhysicsInputError);
      expect(() => bandOverlap(good, bad)).toThrow(PhysicsInputError);
    }
    expect(() => bandOverlap(good, good, -1)).toThrow(PhysicsInputError);
    expect(() => bandOverlap(good, good, NaN)).toThrow(PhysicsInputError);
  });

  it.each([0, -1, NaN, Infinity, -Infinity])('the bulk search refuses field %s', (bad) => {
    expect(() =>
      findStationBandHits({ fieldsTesla: Float64Array.from([0.1, bad]), relativeUncertainty: 0, species: ['electron'], harmonicCount: 1, watchBands: WATCH }),
    ).toThrow(PhysicsInputError);
  });

  it('the bulk search refuses unknown species, bad energies, no species and mismatched uncertainties', () => {
    const base = { fieldsTesla: Float64Array.from([0.1]), relativeUncertainty: 0, harmonicCount: 1, watchBands: WATCH };
    expect(() => findStationBandHits({ ...base, species: ['neutron' as never] })).toThrow(expect.objectContaining({ code: 'UNKNOWN_SPECIES' }));
    expect(() => findStationBandHits({ ...base, species: [{ species: 'electron', kineticEnergyJ: -1 }] })).toThrow(PhysicsInputError);
    expect(() => findStationBandHits({ ...base, species: [{ species: 'electron', kineticEnergyJ: NaN }] })).toThrow(PhysicsInputError);
    expect(() => findStationBandHits({ ...base, species: [] })).toThrow(PhysicsInputError);
    expect(() => findStationBandHits({ ...base, species: ['electron'], relativeUncertainty: Float64Array.from([0.1, 0.1]) })).toThrow(PhysicsInputError);
    expect(() => findStationBandHits({ ...base, species: ['electron'], harmonicCount: 0 })).toThrow(PhysicsInputError);
  });
});

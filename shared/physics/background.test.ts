import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compareWithBackground, earthBackgroundField, subtractBackground } from './background';
import { PhysicsInputError } from './errors';

// NOAA's published WMM test values (WMM2015, WMM2020 and WMM2025 reports), as shipped in the
// geomagnetism package's test/values.csv. Tests may read files; the module under test does not.
const require = createRequire(import.meta.url);
const csvPath = join(dirname(require.resolve('geomagnetism/package.json')), 'test', 'values.csv');
const [header, ...rows] = readFileSync(csvPath, 'utf8').trim().split(/\r?\n/);
const columns = (header ?? '').split(',');
const values = rows.map((line) => Object.fromEntries(line.split(',').map((v, i) => [columns[i], Number(v)])) as Record<string, number>);
// The package's conversion from a date to a decimal year uses 365-day years; invert it exactly.
const dateFromDecimalYear = (year: number): Date => {
  const whole = Math.floor(year);
  return new Date(Date.UTC(whole, 0, 1) + (year - whole) * 365 * 86_400_000);
};
// 2015.21096 is the package authors' own point, not a row of NOAA's tables.
const noaa = values.filter((v) => v.date !== 2015.21096);

describe('World Magnetic Model against NOAA test values', () => {
  it('the shipped table has the NOAA rows for all three models', () => {
    expect(noaa.length).toBeGreaterThanOrEqual(200);
    expect(new Set(noaa.map((v) => Math.floor(v.date as number)))).toEqual(new Set([2015, 2017, 2020, 2021, 2022, 2023, 2024, 2025, 2026, 2027, 2028, 2029]));
  });

  it('reproduces X, Y, Z, H, F to 0.5 nT and inclination/declination to 0.01° (NOAA values are rounded to 0.1 nT, 0.01°)', () => {
    for (const v of noaa) {
      const bg = earthBackgroundField({
        latitudeDeg: v.lat as number,
        longitudeDeg: v.lon as number,
        altitudeM: (v.alt as number) * 1000,
        date: dateFromDecimalYear(v.date as number),
      });
      const nT = 1e9;
      expect(Math.abs(bg.northTesla * nT - (v.x as number))).toBeLessThan(0.5);
      expect(Math.abs(bg.eastTesla * nT - (v.y as number))).toBeLessThan(0.5);
      expect(Math.abs(bg.downTesla * nT - (v.z as number))).toBeLessThan(0.5);
      expect(Math.abs(bg.horizontalTesla * nT - (v.h as number))).toBeLessThan(0.5);
      expect(Math.abs(bg.totalTesla * nT - (v.f as number))).toBeLessThan(0.5);
      expect(Math.abs(bg.inclinationDeg - (v.incl as number))).toBeLessThan(0.01);
      expect(Math.abs(bg.declinationDeg - (v.decl as number))).toBeLessThan(0.01);
    }
  });

  it('surface fields lie in the 22–67 µT range quoted in REFERENCES.md', () => {
    for (const v of noaa.filter((r) => r.alt === 0)) {
      const bg = earthBackgroundField({ latitudeDeg: v.lat as number, longitudeDeg: v.lon as number, altitudeM: 0, date: dateFromDecimalYear(v.date as number) });
      expect(bg.totalTesla).toBeGreaterThan(22e-6);
      expect(bg.totalTesla).toBeLessThan(67e-6);
    }
  });
});

describe('background subtraction and comparison', () => {
  const site = { latitudeDeg: 52.2, longitudeDeg: 0.12, altitudeM: 20, date: new Date(Date.UTC(2026, 3, 1)) };

  it('subtracts the background as a vector: a reading of background plus 1 µT north leaves 1 µT', () => {
    const bg = earthBackgroundField(site);
    const reading = { northTesla: bg.northTesla + 1e-6, eastTesla: bg.eastTesla, downTesla: bg.downTesla };
    const source = subtractBackground(reading, bg);
    expect(source.magnitudeTesla).toBeCloseTo(1e-6, 15);
    expect(source.northTesla).toBeCloseTo(1e-6, 15);
    expect(bg.model).toBe('WMM-2025');
  });

  it('says when a magnitude reading is near the background', () => {
    const bg = earthBackgroundField(site);
    expect(compareWithBackground(60e-6, bg).nearBackground).toBe(true);
    expect(compareWithBackground(0.5e-3, bg)).toMatchObject({ nearBackground: false });
    expect(compareWithBackground(0.5e-3, bg).ratio).toBeCloseTo(0.5e-3 / bg.totalTesla, 12);
  });

  it('refuses dates outside every model, bad coordinates and bad readings', () => {
    expect(() => earthBackgroundField({ ...site, date: new Date(Date.UTC(1999, 0, 1)) })).toThrow(expect.objectContaining({ code: 'OUT_OF_RANGE' }));
    expect(() => earthBackgroundField({ ...site, date: new Date(Date.UTC(2031, 0, 1)) })).toThrow(expect.objectContaining({ code: 'OUT_OF_RANGE' }));
    expect(() => earthBackgroundField({ ...site, date: new Date(NaN) })).toThrow(PhysicsInputError);
    for (const bad of [NaN, Infinity, -Infinity, 91]) expect(() => earthBackgroundField({ ...site, latitudeDeg: bad })).toThrow(PhysicsInputError);
    expect(() => earthBackgroundField({ ...site, altitudeM: -5000 })).toThrow(PhysicsInputError);
    const bg = earthBackgroundField(site);
    expect(() => subtractBackground({ northTesla: NaN, eastTesla: 0, downTesla: 0 }, bg)).toThrow(PhysicsInputError);
    for (const bad of [0, -1e-6, NaN, Infinity]) expect(() => compareWithBackground(bad, bg)).toThrow(PhysicsInputError);
  });
});

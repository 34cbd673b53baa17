/**
 * Antenna-factor CSV parsing: hand-written tables (invented values in the usual range of a biconical or
 * log-periodic survey antenna, roughly 5–40 dB/m — common practice), each refusal with its line number.
 */
import { describe, expect, it } from 'vitest';
import { antennaFactorCsv, parseAntennaFactorCsv } from './antenna-factors';

describe('parseAntennaFactorCsv', () => {
  it('reads a table with a header', () => {
    const csv = 'Frequency (MHz),Antenna factor (dB/m)\n30,18.2\n100,9.6\n300,14.1\n1000,24.3\n';
    expect(parseAntennaFactorCsv(csv)).toEqual({
      ok: true,
      points: [
        { frequencyMHz: 30, antennaFactorDbPerM: 18.2 },
        { frequencyMHz: 100, antennaFactorDbPerM: 9.6 },
        { frequencyMHz: 300, antennaFactorDbPerM: 14.1 },
        { frequencyMHz: 1000, antennaFactorDbPerM: 24.3 },
      ],
    });
  });

  it('reads a table without a header, with semicolons and a BOM, skipping blank and comment lines', () => {
    const csv = '\uFEFF# invented test antenna\n30;18.2\n\n1e3;24.3\n';
    const out = parseAntennaFactorCsv(csv);
    expect(out.ok && out.points.map((p) => p.frequencyMHz)).toEqual([30, 1000]);
  });

  it('lists bad rows with their line numbers', () => {
    const csv = ['frequency_mhz,antenna_factor_db_per_m', '30,18.2', '100,abc', '20,12', '200', '300,500', '-5,3'].join('\n');
    const out = parseAntennaFactorCsv(csv);
    expect(out.ok).toBe(false);
    if (out.ok) return;
    expect(out.errors.map((e) => e.row)).toEqual([3, 4, 5, 6, 7]);
    expect(out.errors[0]!.message).toMatch(/"abc" is not a number/);
    expect(out.errors[1]!.message).toMatch(/increase/);
    expect(out.errors[2]!.message).toMatch(/Expected 2 values/);
    expect(out.errors[3]!.message).toMatch(/check the unit/);
  });

  it('refuses a header in GHz and a one-point table', () => {
    const ghz = parseAntennaFactorCsv('Frequency (GHz),Antenna factor (dB/m)\n1,20\n2,25\n');
    expect(ghz.ok === false && ghz.errors[0]).toEqual({ row: 1, message: 'Give the frequency in MHz.' });
    const one = parseAntennaFactorCsv('30,18.2\n');
    expect(one.ok === false && one.errors[0]!.message).toMatch(/at least two/);
  });

  it('round-trips through the canonical CSV', () => {
    const points = [
      { frequencyMHz: 30, antennaFactorDbPerM: 18.2 },
      { frequencyMHz: 1000, antennaFactorDbPerM: 24.3 },
    ];
    expect(parseAntennaFactorCsv(antennaFactorCsv(points))).toEqual({ ok: true, points });
  });
});

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  antennaFactorDbPerM,
  dbmToDbuv,
  dbmToWatts,
  dbuvMinusDbm,
  dbuvPerMFromFluxDensityDbwPerM2,
  dbuvToDbm,
  dbuvToVolts,
  dbwToWatts,
  displayedNoiseFloorDbm,
  effectiveApertureM2,
  farFieldDistanceM,
  fieldStrengthDbuvPerM,
  fieldStrengthFromDbmDbuvPerM,
  fieldStrengthFromFluxDensityVPerM,
  fluxDensityDbwPerM2FromDbuvPerM,
  fluxDensityFromFieldStrengthWPerM2,
  receivedPowerW,
  voltsToDbuv,
  wattsToDbm,
  wattsToDbw,
  wavelengthM,
} from './analyser';
import { isotropicFluxDensityWPerM2 } from './emission';
import { PhysicsInputError } from './errors';

// Handbook rules as quoted in ../shared/REFERENCES.md (spectrum-analyser arithmetic; Balanis, Antenna Theory;
// CISPR 16-1-x / IEEE Std 291 practice).
describe('decibel conversions (definitions of dBm and dBW)', () => {
  it('0 dBm = 1 mW, 30 dBm = 1 W, −30 dBm = 1 µW; 0 dBW = 1 W', () => {
    expect(dbmToWatts(0)).toBeCloseTo(1e-3, 15);
    expect(dbmToWatts(30)).toBeCloseTo(1, 12);
    expect(dbmToWatts(-30)).toBeCloseTo(1e-6, 18);
    expect(dbwToWatts(0)).toBe(1);
    expect(wattsToDbw(1e-3)).toBeCloseTo(-30, 12);
  });

  it('dBm ↔ W round-trips (property)', () => {
    fc.assert(fc.property(fc.double({ min: -200, max: 100, noNaN: true }), (dbm) => Math.abs(wattsToDbm(dbmToWatts(dbm)) - dbm) < 1e-9));
  });

  it('dBµV = dBm + 106.99 at 50 Ω (handbook) and + 108.75 at 75 Ω (common practice, recalled)', () => {
    expect(dbuvMinusDbm()).toBeCloseTo(106.99, 2);
    expect(dbmToDbuv(-60)).toBeCloseTo(46.99, 2);
    expect(dbuvToDbm(46.99)).toBeCloseTo(-60, 2);
    expect(dbuvMinusDbm(75)).toBeCloseTo(108.75, 2);
  });

  it('1 V is 120 dBµV (definition) and dBµV ↔ V round-trips', () => {
    expect(voltsToDbuv(1)).toBeCloseTo(120, 12);
    expect(dbuvToVolts(0)).toBeCloseTo(1e-6, 18);
  });
});

describe('field strength and flux density', () => {
  it('E[dBµV/m] = V[dBµV] + AF + cable loss (CISPR 16 / IEEE 291 practice)', () => {
    expect(fieldStrengthDbuvPerM(40, 12.5, 2.3)).toBeCloseTo(54.8, 12);
    expect(fieldStrengthFromDbmDbuvPerM(-67, 12.5, 2.3)).toBeCloseTo(-67 + 106.99 + 14.8, 2);
  });

  it('AF = 20·log₁₀(f/MHz) − G[dBi] − 29.77 at 50 Ω (handbook)', () => {
    for (const [fMHz, gDbi] of [
      [30, 0],
      [100, 2.15],
      [1000, 6],
      [2450, 10],
    ] as const) {
      expect(antennaFactorDbPerM(fMHz * 1e6, gDbi)).toBeCloseTo(20 * Math.log10(fMHz) - gDbi - 29.77, 2);
    }
  });

  it('S[dBW/m²] = E[dBµV/m] − 145.76 and back (handbook)', () => {
    expect(fluxDensityDbwPerM2FromDbuvPerM(100)).toBeCloseTo(100 - 145.76, 2);
    expect(dbuvPerMFromFluxDensityDbwPerM2(-45.76)).toBeCloseTo(100, 2);
  });

  it('a 1 V/m plane wave carries 2.65 mW/m² (S = E²/Z₀; common practice)', () => {
    expect(fluxDensityFromFieldStrengthWPerM2(1) * 1e3).toBeCloseTo(2.654, 3);
    expect(fieldStrengthFromFluxDensityVPerM(fluxDensityFromFieldStrengthWPerM2(3.7))).toBeCloseTo(3.7, 12);
  });
});

describe('noise floor and apertures', () => {
  it('noise scales as 10·log₁₀(RBW): kT at 290 K is −174 dBm/Hz, so −114 dBm in 1 MHz (Johnson–Nyquist kTB)', () => {
    const kT290Dbm = 10 * Math.log10(1.380649e-23 * 290) + 30; // Boltzmann constant, exact since 2019
    expect(kT290Dbm).toBeCloseTo(-173.98, 2);
    expect(displayedNoiseFloorDbm(kT290Dbm, 1e6)).toBeCloseTo(-113.98, 2);
    expect(displayedNoiseFloorDbm(-150, 1e3, 10)).toBeCloseTo(-130, 12);
  });

  it('effective aperture Gλ²/4π: isotropic 0.00716 m² at 1 GHz; half-wave dipole (2.15 dBi) ≈ 0.13 λ² (Balanis, recalled)', () => {
    expect(effectiveApertureM2(1e9, 0)).toBeCloseTo(wavelengthM(1e9) ** 2 / (4 * Math.PI), 12);
    expect(effectiveApertureM2(1e9, 0)).toBeCloseTo(0.00715, 4);
    expect(effectiveApertureM2(300e6, 2.15) / wavelengthM(300e6) ** 2).toBeCloseTo(0.13, 2);
  });

  it('received power through the aperture reproduces the Friis equation P_r = P_t·G_t·G_r·(λ/4πd)² (Balanis)', () => {
    const pt = 1e-3;
    const d = 12;
    const f = 1.42e9;
    const gr = 10 ** (9 / 10);
    const friis = pt * gr * (wavelengthM(f) / (4 * Math.PI * d)) ** 2;
    expect(receivedPowerW(isotropicFluxDensityWPerM2(pt, d), f, 9) / friis).toBeCloseTo(1, 12);
  });

  it('the far field of a 1 m antenna at 3 GHz starts at 2D²/λ ≈ 20 m (Balanis)', () => {
    expect(farFieldDistanceM(1, 3e9)).toBeCloseTo(20.0, 1);
  });
});

describe('analyser input errors', () => {
  it.each([NaN, Infinity, -Infinity])('%s is refused by every conversion', (bad) => {
    const calls: Array<() => unknown> = [
      () => dbmToWatts(bad),
      () => wattsToDbm(bad),
      () => dbwToWatts(bad),
      () => wattsToDbw(bad),
      () => dbuvToDbm(bad),
      () => dbmToDbuv(bad),
      () => dbuvMinusDbm(bad),
      () => fieldStrengthDbuvPerM(bad, 0),
      () => fieldStrengthDbuvPerM(0, bad),
      () => fieldStrengthDbuvPerM(0, 0, bad),
      () => fieldStrengthFromDbmDbuvPerM(bad, 0),
      () => antennaFactorDbPerM(bad, 0),
      () => antennaFactorDbPerM(1e8, bad),
      () => fluxDensityFromFieldStrengthWPerM2(bad),
      () => fieldStrengthFromFluxDensityVPerM(bad),
      () => fluxDensityDbwPerM2FromDbuvPerM(bad),
      () => dbuvPerMFromFluxDensityDbwPerM2(bad),
      () => displayedNoiseFloorDbm(bad, 1),
      () => displayedNoiseFloorDbm(-150, bad),
      () => effectiveApertureM2(bad, 0),
      () => receivedPowerW(bad, 1e9, 0),
      () => farFieldDistanceM(bad, 1e9),
      () => voltsToDbuv(bad),
      () => dbuvToVolts(bad),
      () => wavelengthM(bad),
    ];
    for (const call of calls) expect(call).toThrow(PhysicsInputError);
  });

  it('zero or negative powers, frequencies, bandwidths and losses are refused', () => {
    expect(() => wattsToDbm(0)).toThrow(PhysicsInputError);
    expect(() => wattsToDbm(-1)).toThrow(PhysicsInputError);
    expect(() => wavelengthM(0)).toThrow(PhysicsInputError);
    expect(() => displayedNoiseFloorDbm(-150, 0)).toThrow(PhysicsInputError);
    expect(() => fieldStrengthDbuvPerM(0, 0, -1)).toThrow(PhysicsInputError);
    expect(() => dbuvMinusDbm(0)).toThrow(PhysicsInputError);
    expect(() => voltsToDbuv(0)).toThrow(PhysicsInputError);
  });
});

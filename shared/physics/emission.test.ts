import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  gyroRadiationPowerW,
  isotropicFluxDensityWPerM2,
  larmorPowerCircularW,
  larmorPowerW,
  meanPerpendicularEnergyJ,
  PER_VOLUME_EMISSION_COEFFICIENT_W_M3_PER_T2_EV,
  perVolumeEmissionWPerM3,
  totalEmissionPowerW,
} from './emission';
import { PhysicsInputError } from './errors';

// CODATA 2018 digits typed from the NIST listing (independent of constants.ts).
const E = 1.602176634e-19;
const C = 299792458;
const ME = 9.1093837015e-31;
const EPS0 = 8.8541878128e-12;
const MU0 = 1.25663706212e-6;
// recalled: Thomson cross section σ_T = 6.652 458 7321e-29 m² (CODATA 2018, NIST listing)
const SIGMA_T = 6.6524587321e-29;

describe('Larmor power (Jackson, Classical Electrodynamics, 3rd ed., §14.2)', () => {
  it('P = q²a²/(6πε₀c³): an electron accelerated at 1e20 m/s² radiates 5.7e-14 W', () => {
    const expected = (E * E * 1e40) / (6 * Math.PI * EPS0 * C ** 3);
    expect(larmorPowerW(-E, 1e20)).toBeCloseTo(expected, 25);
    expect(expected).toBeCloseTo(5.71e-14, 15);
  });

  it('on a gyro-orbit a = ω_c·v⊥ with ω_c = eB/m', () => {
    const b = 0.1;
    const v = 1e6;
    const omega = (E * b) / ME;
    expect(larmorPowerCircularW('electron', b, v) / ((E * E * (omega * v) ** 2) / (6 * Math.PI * EPS0 * C ** 3))).toBeCloseTo(1, 12);
  });

  it('the relativistic form equals 2σ_T·c·U_B·β²γ²·sin²α for electrons (Rybicki & Lightman, §6.1)', () => {
    for (const [energyEv, b, alpha] of [
      [1, 1e-3, Math.PI / 2],
      [1e4, 0.1, Math.PI / 3],
      [1e6, 1, Math.PI / 2],
      [1e9, 3, 0.2],
    ] as const) {
      const gamma = 1 + (energyEv * E) / (ME * C * C);
      const beta2 = 1 - 1 / gamma ** 2;
      const expected = 2 * SIGMA_T * C * (b * b / (2 * MU0)) * beta2 * gamma ** 2 * Math.sin(alpha) ** 2;
      expect(Math.abs(gyroRadiationPowerW('electron', b, energyEv * E, alpha) / expected - 1)).toBeLessThan(1e-6);
    }
  });

  it('the relativistic form reduces to the non-relativistic one at low energy and exceeds it by γ² higher up', () => {
    const energy = 1 * E;
    const v = Math.sqrt((2 * energy) / ME);
    expect(gyroRadiationPowerW('electron', 0.05, energy) / larmorPowerCircularW('electron', 0.05, v)).toBeCloseTo(1, 5);
  });
});

// Per-volume emission: P/V = C·nₑ·B²·⟨W⊥⟩, C = e⁵/(3πε₀mₑ³c³) ≈ 6.21e-20 W·m³·T⁻²·eV⁻¹ (from Larmor, Jackson §14.2);
// the NRL Plasma Formulary (2019) prints 6.21e-28 for W/cm³ with B in gauss and n in cm⁻³.
describe('per-volume emission of an electron plasma', () => {
  it('the coefficient is 6.21e-20 in SI (Jackson, derived from Larmor)', () => {
    expect(PER_VOLUME_EMISSION_COEFFICIENT_W_M3_PER_T2_EV.toPrecision(3)).toBe('6.21e-20');
    expect(PER_VOLUME_EMISSION_COEFFICIENT_W_M3_PER_T2_EV / (E ** 5 / (3 * Math.PI * EPS0 * ME ** 3 * C ** 3))).toBeCloseTo(1, 12);
  });

  it('≈ 6.21e-20·nₑ·B²·E for a fluorescent-lamp-like plasma (nₑ = 1e17 m⁻³, B = 30 mT, kTₑ = 1 eV)', () => {
    const { powerPerVolumeWPerM3 } = perVolumeEmissionWPerM3({ densityPerM3: 1e17, fieldTesla: 0.03, energyJ: 1 * E, energyKind: 'temperature' });
    expect(powerPerVolumeWPerM3 / (6.21e-20 * 1e17 * 0.03 ** 2 * 1)).toBeCloseTo(1, 3);
  });

  it('agrees with the NRL formulary’s 6.21e-28 when the inputs are converted to cgs (W/cm³, G, cm⁻³)', () => {
    const n = 3e16;
    const b = 0.2;
    const tEv = 5;
    const si = perVolumeEmissionWPerM3({ densityPerM3: n, fieldTesla: b, energyJ: tEv * E, energyKind: 'perpendicular' }).powerPerVolumeWPerM3;
    const nrlWPerCm3 = 6.21e-28 * (b * 1e4) ** 2 * (n * 1e-6) * tEv;
    expect((si * 1e-6) / nrlWPerCm3).toBeCloseTo(1, 3);
  });

  it('the 10⁸ trap: 6.21e-28 with SI inputs is 10⁸ too small — our result is not that', () => {
    const n = 1e17;
    const b = 0.03;
    const si = perVolumeEmissionWPerM3({ densityPerM3: n, fieldTesla: b, energyJ: E, energyKind: 'perpendicular' }).powerPerVolumeWPerM3;
    const wrong = 6.21e-28 * n * b * b * 1;
    expect(si / wrong).toBeCloseTo(1e8, -5);
  });

  it('for the mean TOTAL energy of an isotropic plasma the perpendicular share is 2/3', () => {
    const base = { densityPerM3: 1e16, fieldTesla: 0.1, energyJ: 3 * E };
    const perp = perVolumeEmissionWPerM3({ ...base, energyKind: 'perpendicular' }).powerPerVolumeWPerM3;
    const total = perVolumeEmissionWPerM3({ ...base, energyKind: 'totalIsotropic' });
    expect(total.powerPerVolumeWPerM3 / perp).toBeCloseTo(2 / 3, 12);
    expect(total.meanPerpendicularEnergyJ).toBeCloseTo(2 * E, 30);
    // a Maxwellian with kT: mean total energy 3/2 kT → ⟨W⊥⟩ = kT
    expect(meanPerpendicularEnergyJ(1.5 * E, 'totalIsotropic')).toBeCloseTo(meanPerpendicularEnergyJ(E, 'temperature'), 30);
  });

  it('is linear in density and energy and quadratic in B (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e10, max: 1e20, noNaN: true }), fc.double({ min: 1e-6, max: 10, noNaN: true }), fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (n, b, tEv) => {
        const p = (nn: number, bb: number, t: number) =>
          perVolumeEmissionWPerM3({ densityPerM3: nn, fieldTesla: bb, energyJ: t * E, energyKind: 'perpendicular' }).powerPerVolumeWPerM3;
        const base = p(n, b, tEv);
        return Math.abs(p(2 * n, b, tEv) / base - 2) < 1e-12 && Math.abs(p(n, 2 * b, tEv) / base - 4) < 1e-12 && Math.abs(p(n, b, 2 * tEv) / base - 2) < 1e-12;
      }),
    );
  });

  it('total power of a volume and the flux density S = P/(4πd²) at a distance', () => {
    const input = { densityPerM3: 1e17, fieldTesla: 0.03, energyJ: E, energyKind: 'temperature' as const };
    const total = totalEmissionPowerW({ ...input, volumeM3: 2e-4 });
    expect(total).toBeCloseTo(perVolumeEmissionWPerM3(input).powerPerVolumeWPerM3 * 2e-4, 30);
    expect(isotropicFluxDensityWPerM2(1, 1)).toBeCloseTo(1 / (4 * Math.PI), 15);
    expect(isotropicFluxDensityWPerM2(4, 2) / isotropicFluxDensityWPerM2(1, 1)).toBeCloseTo(1, 12);
  });
});

describe('emission input errors', () => {
  const ok = { densityPerM3: 1e16, fieldTesla: 0.1, energyJ: E, energyKind: 'perpendicular' as const };
  it.each([0, -0.1, NaN, Infinity, -Infinity])('field %s is refused', (bad) => {
    expect(() => perVolumeEmissionWPerM3({ ...ok, fieldTesla: bad })).toThrow(PhysicsInputError);
    expect(() => larmorPowerCircularW('electron', bad, 1e5)).toThrow(PhysicsInputError);
    expect(() => gyroRadiationPowerW('electron', bad, E)).toThrow(PhysicsInputError);
  });

  it('energies that are negative, non-finite or relativistic are refused', () => {
    for (const bad of [-E, NaN, Infinity]) {
      expect(() => perVolumeEmissionWPerM3({ ...ok, energyJ: bad })).toThrow(PhysicsInputError);
      expect(() => gyroRadiationPowerW('electron', 1, bad)).toThrow(PhysicsInputError);
    }
    expect(() => perVolumeEmissionWPerM3({ ...ok, energyJ: 30e3 * E })).toThrow(expect.objectContaining({ code: 'OUT_OF_RANGE' }));
    expect(() => gyroRadiationPowerW('electron', 1, 2e12 * E)).toThrow(expect.objectContaining({ code: 'OUT_OF_RANGE' }));
  });

  it('bad densities, volumes, distances, energy kinds, charges and species are refused', () => {
    expect(() => perVolumeEmissionWPerM3({ ...ok, densityPerM3: 0 })).toThrow(PhysicsInputError);
    expect(() => perVolumeEmissionWPerM3({ ...ok, energyKind: 'mean' as never })).toThrow(PhysicsInputError);
    expect(() => perVolumeEmissionWPerM3({ ...ok, species: 'pion' as never })).toThrow(expect.objectContaining({ code: 'UNKNOWN_SPECIES' }));
    expect(() => totalEmissionPowerW({ ...ok, volumeM3: -1 })).toThrow(PhysicsInputError);
    expect(() => isotropicFluxDensityWPerM2(1, 0)).toThrow(PhysicsInputError);
    expect(() => isotropicFluxDensityWPerM2(NaN, 1)).toThrow(PhysicsInputError);
    expect(() => larmorPowerW(0, 1)).toThrow(PhysicsInputError);
    expect(() => larmorPowerW(E, -1)).toThrow(PhysicsInputError);
    expect(() => larmorPowerCircularW('electron', 1, C)).toThrow(PhysicsInputError);
    expect(() => gyroRadiationPowerW('electron', 1, E, -0.1)).toThrow(PhysicsInputError);
  });
});

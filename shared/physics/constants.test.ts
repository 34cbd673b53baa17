import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import {
  ALPHA_MASS_KG,
  ATOMIC_MASS_UNIT_KG,
  CODATA_EDITION,
  DEUTERON_MASS_KG,
  ELECTRON_MASS_KG,
  ELECTRON_VOLT_J,
  ELEMENTARY_CHARGE_C,
  electronVoltsToJoules,
  HELION_MASS_KG,
  joulesToElectronVolts,
  PROTON_GYROMAGNETIC_RATIO_OVER_2PI_HZ_PER_T,
  PROTON_MASS_KG,
  restEnergyJ,
  SPEED_OF_LIGHT_M_PER_S,
  VACUUM_IMPEDANCE_OHM,
  VACUUM_PERMEABILITY_N_PER_A2,
  VACUUM_PERMITTIVITY_F_PER_M,
} from './constants';
import { PhysicsInputError } from './errors';

// Expected digits are typed from the NIST listing of the CODATA 2018 adjustment
// (Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)) as quoted in ../shared/REFERENCES.md.
// Values marked "recalled" were not read from the listing in this session.
describe('CODATA 2018 constants (NIST listing)', () => {
  it.each([
    ['speed of light c (exact)', SPEED_OF_LIGHT_M_PER_S, 299792458],
    ['elementary charge e (exact)', ELEMENTARY_CHARGE_C, 1.602176634e-19],
    ['electron volt (exact, = e J)', ELECTRON_VOLT_J, 1.602176634e-19],
    ['electron mass', ELECTRON_MASS_KG, 9.1093837015e-31],
    ['proton mass', PROTON_MASS_KG, 1.67262192369e-27],
    ['deuteron mass', DEUTERON_MASS_KG, 3.3435837724e-27],
    ['alpha particle mass', ALPHA_MASS_KG, 6.6446573357e-27],
    ['atomic mass constant', ATOMIC_MASS_UNIT_KG, 1.6605390666e-27],
    ['vacuum permittivity', VACUUM_PERMITTIVITY_F_PER_M, 8.8541878128e-12],
    ['vacuum permeability', VACUUM_PERMEABILITY_N_PER_A2, 1.25663706212e-6],
    ['vacuum impedance', VACUUM_IMPEDANCE_OHM, 376.730313668],
    // recalled: helion mass 5.006 412 7796(15) e-27 kg
    ['helion mass (recalled)', HELION_MASS_KG, 5.0064127796e-27],
    // recalled: proton gyromagnetic ratio over 2π (NMR precession), 42.577 478 518 MHz/T
    ['proton gyromagnetic ratio / 2π (recalled)', PROTON_GYROMAGNETIC_RATIO_OVER_2PI_HZ_PER_T, 42.577478518e6],
  ])('%s matches the listing', (_name, actual, expected) => {
    expect(actual).toBe(expected);
  });

  // NIST also lists each mass in u (recalled digits); kg/u must reproduce m_u to the listing's rounding.
  // A typo in any digit of a kg value would break this by far more than 1e-10.
  it.each([
    ['electron', ELECTRON_MASS_KG, 5.48579909065e-4],
    ['proton', PROTON_MASS_KG, 1.007276466621],
    ['deuteron', DEUTERON_MASS_KG, 2.013553212745],
    ['helion', HELION_MASS_KG, 3.014932247175],
    ['alpha', ALPHA_MASS_KG, 4.001506179127],
  ])('%s mass in kg agrees with its NIST value in u (recalled) to 1e-10', (_name, kg, inU) => {
    expect(Math.abs(kg / (inU * ATOMIC_MASS_UNIT_KG) - 1)).toBeLessThan(1e-10);
  });

  it('ε₀μ₀c² = 1 and Z₀ = μ₀c within the CODATA 2018 uncertainties (1.5e-10)', () => {
    const c = SPEED_OF_LIGHT_M_PER_S;
    expect(Math.abs(VACUUM_PERMITTIVITY_F_PER_M * VACUUM_PERMEABILITY_N_PER_A2 * c * c - 1)).toBeLessThan(3e-10);
    expect(Math.abs(VACUUM_IMPEDANCE_OHM / (VACUUM_PERMEABILITY_N_PER_A2 * c) - 1)).toBeLessThan(3e-10);
  });

  it('the proton-electron mass ratio is 1836.152 673 43 (NIST, recalled)', () => {
    expect(PROTON_MASS_KG / ELECTRON_MASS_KG).toBeCloseTo(1836.15267343, 7);
  });

  it('electron rest energy is 0.510 998 950 00 MeV and proton 938.272 088 16 MeV (NIST, recalled)', () => {
    expect(restEnergyJ(ELECTRON_MASS_KG) / ELECTRON_VOLT_J / 1e6).toBeCloseTo(0.51099895, 9);
    expect(restEnergyJ(PROTON_MASS_KG) / ELECTRON_VOLT_J / 1e6).toBeCloseTo(938.27208816, 6);
  });

  it('names the pinned edition', () => {
    expect(CODATA_EDITION).toBe('CODATA 2018');
  });
});

describe('cross-check against mathjs (its c, e, mₑ, mₚ, ε₀, μ₀ are CODATA 2018)', () => {
  it.each([
    ['speedOfLight', SPEED_OF_LIGHT_M_PER_S, 'm/s'],
    ['elementaryCharge', ELEMENTARY_CHARGE_C, 'C'],
    ['electronMass', ELECTRON_MASS_KG, 'kg'],
    ['protonMass', PROTON_MASS_KG, 'kg'],
    ['electricConstant', VACUUM_PERMITTIVITY_F_PER_M, 'F/m'],
    ['magneticConstant', VACUUM_PERMEABILITY_N_PER_A2, 'N/A^2'],
  ] as const)('mathjs %s agrees to 1e-12 relative', (name, ours, unit) => {
    const theirs = (math[name] as math.Unit).toNumber(unit);
    expect(Math.abs(theirs / ours - 1)).toBeLessThan(1e-12);
  });

  it('our electron volt is NOT mathjs’s stale 2010 value (1.602176565e-19 J)', () => {
    const mathjsEv = math.unit('1 eV').toNumber('J');
    expect(mathjsEv).toBe(1.602176565e-19);
    expect(ELECTRON_VOLT_J).not.toBe(mathjsEv);
    expect(electronVoltsToJoules(1)).toBe(1.602176634e-19);
  });

  it('our deuteron mass is NOT mathjs’s stale value', () => {
    const mathjsDeuteron = math.deuteronMass.toNumber('kg');
    expect(Math.abs(mathjsDeuteron / DEUTERON_MASS_KG - 1)).toBeGreaterThan(1e-7);
  });
});

describe('energy conversions', () => {
  it('1 keV is 1000 × e joules (exact SI definition) and converts back', () => {
    expect(electronVoltsToJoules(1000)).toBe(1000 * 1.602176634e-19);
    expect(joulesToElectronVolts(electronVoltsToJoules(12.5))).toBeCloseTo(12.5, 12);
  });

  it.each([NaN, Infinity, -Infinity])('rejects %s with the typed error', (bad) => {
    expect(() => electronVoltsToJoules(bad)).toThrow(PhysicsInputError);
    expect(() => joulesToElectronVolts(bad)).toThrow(PhysicsInputError);
    expect(() => restEnergyJ(bad)).toThrow(PhysicsInputError);
  });

  it('rest energy needs a positive mass', () => {
    expect(() => restEnergyJ(0)).toThrow(PhysicsInputError);
    expect(() => restEnergyJ(-1)).toThrow(PhysicsInputError);
  });
});

/**
 * Physical constants in SI, pinned to ONE edition: CODATA 2018.
 *
 * Source: E. Tiesinga, P. J. Mohr, D. B. Newell, B. N. Taylor, "CODATA recommended values of the
 * fundamental physical constants: 2018", Rev. Mod. Phys. 93, 025010 (2021); NIST listing of the 2018
 * adjustment (physics.nist.gov/cuu/Constants). Exact values follow the 2019 SI redefinition.
 *
 * Do not mix editions: CODATA 2022 moved e/mₑ by about 1.4e-9 relative. Do not take constants from a
 * general-purpose library at run time: mathjs (used only as a cross-check in tests) carries a 2010
 * electron-volt and stale deuteron/neutron masses.
 */

import { requireFinite, requirePositive } from './errors';

/** Speed of light in vacuum c, m/s (exact). */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;

/** Elementary charge e, C (exact). */
export const ELEMENTARY_CHARGE_C = 1.602_176_634e-19;

/** Planck constant h, J·s (exact). */
export const PLANCK_CONSTANT_J_S = 6.626_070_15e-34;

/** Electron volt, J (exact: 1 eV = e × 1 V). */
export const ELECTRON_VOLT_J = ELEMENTARY_CHARGE_C;

/** Electron mass mₑ, kg (CODATA 2018, relative standard uncertainty 3.0e-10). */
export const ELECTRON_MASS_KG = 9.109_383_7015e-31;

/** Proton mass mₚ, kg (CODATA 2018, 3.1e-10). */
export const PROTON_MASS_KG = 1.672_621_923_69e-27;

/** Deuteron mass m_d, kg (CODATA 2018, 3.0e-10). */
export const DEUTERON_MASS_KG = 3.343_583_7724e-27;

/** Helion (³He nucleus) mass m_h, kg (CODATA 2018, 3.0e-10). */
export const HELION_MASS_KG = 5.006_412_7796e-27;

/** Alpha particle (⁴He nucleus) mass m_α, kg (CODATA 2018, 3.0e-10). */
export const ALPHA_MASS_KG = 6.644_657_3357e-27;

/** Atomic mass constant m_u = 1 u (unified atomic mass unit), kg (CODATA 2018, 3.0e-10). */
export const ATOMIC_MASS_UNIT_KG = 1.660_539_066_60e-27;

/** Vacuum electric permittivity ε₀, F/m (CODATA 2018, 1.5e-10; no longer exact since 2019). */
export const VACUUM_PERMITTIVITY_F_PER_M = 8.854_187_8128e-12;

/** Vacuum magnetic permeability μ₀, N/A² (CODATA 2018, 1.5e-10; no longer exactly 4π×10⁻⁷). */
export const VACUUM_PERMEABILITY_N_PER_A2 = 1.256_637_062_12e-6;

/** Characteristic impedance of vacuum Z₀ = μ₀c, Ω (CODATA 2018). */
export const VACUUM_IMPEDANCE_OHM = 376.730_313_668;

/**
 * Proton gyromagnetic ratio over 2π, γₚ/2π, Hz/T (CODATA 2018: 42.577 478 518 MHz/T).
 *
 * This is NMR PRECESSION (the frequency an MRI scanner receives at), NOT a cyclotron line: it is the
 * proton cyclotron frequency times μₚ/μ_N ≈ 2.793. Use it only for an MR scanner's receive band, and
 * label the result as precession. See {@link protonPrecessionFrequencyHz} in lines.ts.
 */
export const PROTON_GYROMAGNETIC_RATIO_OVER_2PI_HZ_PER_T = 42.577_478_518e6;

/** The CODATA edition every constant here follows. Shown in reports next to computed values. */
export const CODATA_EDITION = 'CODATA 2018';

/** Rest energy m·c² in joules. */
export function restEnergyJ(massKg: number): number {
  requirePositive(massKg, 'massKg');
  return massKg * SPEED_OF_LIGHT_M_PER_S * SPEED_OF_LIGHT_M_PER_S;
}

/** Converts electron volts to joules: E[J] = E[eV] × e (exact). */
export function electronVoltsToJoules(energyEv: number): number {
  requireFinite(energyEv, 'energyEv');
  return energyEv * ELECTRON_VOLT_J;
}

/** Converts joules to electron volts: E[eV] = E[J] / e (exact). */
export function joulesToElectronVolts(energyJ: number): number {
  requireFinite(energyJ, 'energyJ');
  return energyJ / ELECTRON_VOLT_J;
}

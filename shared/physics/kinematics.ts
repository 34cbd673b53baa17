/**
 * Relativistic kinematics of a charged particle from its kinetic energy, and its motion in a magnetic
 * field (rigidity, gyroradius). SI throughout: energy in J, speed in m/s, momentum in kg·m/s.
 *
 * Formulas (special relativity; e.g. Jackson, Classical Electrodynamics, 3rd ed., §11.5, §12.2; Particle
 * Data Group, Review of Particle Physics, "Kinematics"):
 *   γ = 1 + E_k/(mc²)          pc = √(E_k² + 2E_k·mc²)          β = pc/(E_k + mc²)
 *   Bρ = p/|q|  (PDG: Bρ[T·m] = 3.3356·p[GeV/c]/z)          r = p⊥/(|q|B)
 *
 * β is computed as pc/(E_k + mc²) rather than √(1 − 1/γ²), which loses all digits at low energy.
 */

import { SPEED_OF_LIGHT_M_PER_S, ELEMENTARY_CHARGE_C, ELECTRON_VOLT_J } from './constants';
import { PhysicsInputError, requireInRange, requireNonNegative, requirePositive } from './errors';
import { resolveSpecies, type Species, type SpeciesRef } from './species';

/**
 * Largest kinetic energy accepted anywhere: 1 TeV. Far beyond anything in a fringe-field survey (an
 * isotope cyclotron reaches tens of MeV); it catches unit slips such as joules typed as electron volts
 * squared, and keeps γ in a range where double precision is comfortable.
 */
export const MAX_KINETIC_ENERGY_J = 1e12 * ELECTRON_VOLT_J;

const C = SPEED_OF_LIGHT_M_PER_S;
const C2 = C * C;

/** Validates a kinetic energy: finite, ≥ 0, ≤ {@link MAX_KINETIC_ENERGY_J}. */
export function requireKineticEnergyJ(kineticEnergyJ: number, name = 'kineticEnergyJ'): number {
  requireNonNegative(kineticEnergyJ, name);
  return requireInRange(kineticEnergyJ, name, 0, MAX_KINETIC_ENERGY_J, 'J');
}

/** Validates a field magnitude: finite and > 0 (a cyclotron line or gyroradius needs a field). */
export function requireFieldTesla(fieldTesla: number, name = 'fieldTesla'): number {
  return requirePositive(fieldTesla, name);
}

/** Unchecked γ = 1 + E_k/(mc²) (inputs already validated). */
function lorentzFactorUnchecked(massKg: number, kineticEnergyJ: number): number {
  return 1 + kineticEnergyJ / (massKg * C2);
}

/** Unchecked p = √(E_k² + 2E_k·mc²)/c. */
function momentumUnchecked(massKg: number, kineticEnergyJ: number): number {
  return Math.sqrt(kineticEnergyJ * (kineticEnergyJ + 2 * massKg * C2)) / C;
}

/**
 * Lorentz factor γ = 1 + E_k/(mc²) (special relativity; PDG "Kinematics").
 * @param kineticEnergyJ kinetic energy E_k in joules, 0 ≤ E_k ≤ 1 TeV
 */
export function lorentzFactor(species: SpeciesRef, kineticEnergyJ: number): number {
  const s = resolveSpecies(species);
  requireKineticEnergyJ(kineticEnergyJ);
  return lorentzFactorUnchecked(s.massKg, kineticEnergyJ);
}

/**
 * Speed over c, β = pc/(E_k + mc²) = √(E_k² + 2E_k·mc²)/(E_k + mc²) (PDG "Kinematics"); exact at low E_k.
 */
export function betaFromKineticEnergy(species: SpeciesRef, kineticEnergyJ: number): number {
  const s = resolveSpecies(species);
  requireKineticEnergyJ(kineticEnergyJ);
  const restJ = s.massKg * C2;
  return Math.sqrt(kineticEnergyJ * (kineticEnergyJ + 2 * restJ)) / (kineticEnergyJ + restJ);
}

/** Speed v = β·c in m/s from kinetic energy (see {@link betaFromKineticEnergy}). */
export function speedFromKineticEnergyMPerS(species: SpeciesRef, kineticEnergyJ: number): number {
  return betaFromKineticEnergy(species, kineticEnergyJ) * C;
}

/** Momentum p = √(E_k² + 2E_k·mc²)/c in kg·m/s from kinetic energy (PDG "Kinematics"). */
export function momentumFromKineticEnergyKgMPerS(species: SpeciesRef, kineticEnergyJ: number): number {
  const s = resolveSpecies(species);
  requireKineticEnergyJ(kineticEnergyJ);
  return momentumUnchecked(s.massKg, kineticEnergyJ);
}

/**
 * Kinetic energy E_k = (γ − 1)mc² from a speed 0 ≤ v < c, with γ − 1 = β²/(√(1−β²)(1+√(1−β²)))
 * to keep low-speed digits.
 */
export function kineticEnergyFromSpeedJ(species: SpeciesRef, speedMPerS: number): number {
  const s = resolveSpecies(species);
  requireNonNegative(speedMPerS, 'speedMPerS');
  if (speedMPerS >= C) {
    throw new PhysicsInputError('OUT_OF_RANGE', `speedMPerS must be below the speed of light (got ${speedMPerS}).`, {
      field: 'speedMPerS',
      value: speedMPerS,
    });
  }
  const beta2 = (speedMPerS / C) ** 2;
  const root = Math.sqrt(1 - beta2);
  return (beta2 / (root * (1 + root))) * s.massKg * C2;
}

/**
 * Magnetic rigidity Bρ = p/|q| in T·m (PDG, Review of Particle Physics, "Passage of particles"/detector
 * review: p[GeV/c] = 0.2998·z·B[T]·ρ[m], i.e. Bρ[T·m] = 3.3356·p[GeV/c]/z).
 */
export function magneticRigidityTeslaMetre(species: SpeciesRef, kineticEnergyJ: number): number {
  const s = resolveSpecies(species);
  requireKineticEnergyJ(kineticEnergyJ);
  return momentumUnchecked(s.massKg, kineticEnergyJ) / (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C);
}

/**
 * Gyroradius (Larmor radius) r = p⊥/(|q|B) = p·sin α/(|q|B) in metres, relativistic
 * (Jackson §12.2; NRL Plasma Formulary 2019, "Fundamental plasma parameters", in Gaussian units).
 * @param pitchAngleRad angle α between velocity and field, 0..π; default π/2 (all motion perpendicular)
 */
export function gyroradiusM(
  species: SpeciesRef,
  fieldTesla: number,
  kineticEnergyJ: number,
  pitchAngleRad = Math.PI / 2,
): number {
  const s = resolveSpecies(species);
  requireFieldTesla(fieldTesla);
  requireKineticEnergyJ(kineticEnergyJ);
  requireInRange(pitchAngleRad, 'pitchAngleRad', 0, Math.PI, 'rad');
  const perpendicularMomentum = momentumUnchecked(s.massKg, kineticEnergyJ) * Math.sin(pitchAngleRad);
  return perpendicularMomentum / (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C * fieldTesla);
}

/**
 * Gyroradius from speeds: r = γ·m·v⊥/(|q|B), with γ = 1/√(1 − (v⊥² + v∥²)/c²).
 * For a thermal radius pass v⊥ = (kT/m)^½ — the NRL Plasma Formulary's convention; some texts use the
 * most probable speed (2kT/m)^½ and get radii √2 larger. Say which one a figure uses.
 */
export function gyroradiusFromSpeedM(
  species: SpeciesRef,
  fieldTesla: number,
  perpendicularSpeedMPerS: number,
  parallelSpeedMPerS = 0,
): number {
  const s = resolveSpecies(species);
  requireFieldTesla(fieldTesla);
  requireNonNegative(perpendicularSpeedMPerS, 'perpendicularSpeedMPerS');
  requireNonNegative(Math.abs(parallelSpeedMPerS), 'parallelSpeedMPerS');
  const beta2 = (perpendicularSpeedMPerS ** 2 + parallelSpeedMPerS ** 2) / C2;
  if (beta2 >= 1) {
    throw new PhysicsInputError('OUT_OF_RANGE', 'The particle speed must be below the speed of light.', {
      field: 'perpendicularSpeedMPerS',
      value: perpendicularSpeedMPerS,
    });
  }
  const gamma = 1 / Math.sqrt(1 - beta2);
  return (gamma * s.massKg * perpendicularSpeedMPerS) / (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C * fieldTesla);
}

/**
 * Resolves a species and validates a kinetic energy in one go, returning the species and its
 * γ = 1 + E_k/(mc²). Throws UNKNOWN_SPECIES or the energy's error.
 */
export function resolveSpeciesAndEnergy(species: SpeciesRef, kineticEnergyJ: number): { s: Species; gamma: number } {
  const s = resolveSpecies(species);
  requireKineticEnergyJ(kineticEnergyJ);
  return { s, gamma: lorentzFactorUnchecked(s.massKg, kineticEnergyJ) };
}

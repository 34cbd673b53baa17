/**
 * Power radiated by gyrating charges, summed over harmonics (the fundamental carries nearly all of it in
 * the non-relativistic regime: harmonic n is weaker by roughly (v/c)^(2n−2)).
 *
 *   Larmor:                     P = q²a²/(6πε₀c³)                          Jackson §14.2; Griffiths ch. 11
 *   gyro-orbit, non-relativ.:   a = ω_c·v⊥, ω_c = |q|B/m  ⇒  P = q²ω_c²v⊥²/(6πε₀c³)
 *   relativistic (Liénard):     P = q²γ⁴ω_c²v⊥²/(6πε₀c³), ω_c = |q|B/(γm)   Jackson §14.2 (for a ⊥ v)
 *   plasma, per volume:         P/V = nₑ·e⁴B²⟨W⊥⟩/(3πε₀mₑ³c³) = C·nₑ·B²·⟨W⊥⟩[eV],
 *                               C = e⁵/(3πε₀mₑ³c³) ≈ 6.21e-20 W·m³·T⁻²·eV⁻¹   (SI: nₑ in m⁻³, B in T)
 *   isotropic emitter:          S = P/(4πd²)
 *
 * The NRL Plasma Formulary prints the per-volume law with 6.21e-28, which is for W/cm³ with B in gauss
 * and n in cm⁻³ — using that coefficient with SI inputs is a factor-10⁸ error. The per-volume law is for
 * an optically thin plasma (no reabsorption; dense plasmas reabsorb their own cyclotron emission) and is
 * non-relativistic: it is refused above ⟨W⊥⟩ = 5 % of mc², where the γ² correction would pass 10 %.
 */

import {
  ELECTRON_MASS_KG,
  ELECTRON_VOLT_J,
  ELEMENTARY_CHARGE_C,
  SPEED_OF_LIGHT_M_PER_S,
  VACUUM_PERMITTIVITY_F_PER_M,
} from './constants';
import { PhysicsInputError, requireFinite, requireInRange, requireNonNegative, requirePositive } from './errors';
import { requireFieldTesla, requireKineticEnergyJ } from './kinematics';
import { resolveSpecies, type SpeciesRef } from './species';

const C = SPEED_OF_LIGHT_M_PER_S;
const EPS0 = VACUUM_PERMITTIVITY_F_PER_M;

/**
 * Per-volume cyclotron emission coefficient of an electron plasma, C = e⁵/(3πε₀mₑ³c³)
 * ≈ 6.21e-20 W·m³·T⁻²·eV⁻¹ (derived from Larmor, Jackson §14.2; same law as the NRL Plasma Formulary's
 * 6.21e-28 in Gaussian-practical units W/cm³, G, cm⁻³).
 */
export const PER_VOLUME_EMISSION_COEFFICIENT_W_M3_PER_T2_EV =
  ELEMENTARY_CHARGE_C ** 5 / (3 * Math.PI * EPS0 * ELECTRON_MASS_KG ** 3 * C ** 3);

/** Largest ⟨W⊥⟩/(mc²) accepted by the non-relativistic per-volume law. */
export const PER_VOLUME_MAX_ENERGY_OVER_REST = 0.05;

/**
 * Larmor power P = q²a²/(6πε₀c³) in W (Jackson §14.2; Griffiths §11.2.1).
 * @param chargeC charge (sign irrelevant)
 * @param accelerationMPerS2 magnitude of the acceleration, ≥ 0
 */
export function larmorPowerW(chargeC: number, accelerationMPerS2: number): number {
  requireFinite(chargeC, 'chargeC');
  if (chargeC === 0) {
    throw new PhysicsInputError('NOT_POSITIVE', 'chargeC must not be zero.', { field: 'chargeC', value: 0 });
  }
  requireNonNegative(accelerationMPerS2, 'accelerationMPerS2');
  return (chargeC * chargeC * accelerationMPerS2 * accelerationMPerS2) / (6 * Math.PI * EPS0 * C ** 3);
}

/**
 * Non-relativistic Larmor power of a charge on a gyro-orbit: a = ω_c·v⊥, ω_c = |q|B/m, so
 * P = q²ω_c²v⊥²/(6πε₀c³) in W (Jackson §14.2). Valid for v⊥ ≪ c; see {@link gyroRadiationPowerW}.
 */
export function larmorPowerCircularW(species: SpeciesRef, fieldTesla: number, perpendicularSpeedMPerS: number): number {
  const s = resolveSpecies(species);
  requireFieldTesla(fieldTesla);
  requireNonNegative(perpendicularSpeedMPerS, 'perpendicularSpeedMPerS');
  if (perpendicularSpeedMPerS >= C) {
    throw new PhysicsInputError('OUT_OF_RANGE', 'perpendicularSpeedMPerS must be below the speed of light.', {
      field: 'perpendicularSpeedMPerS',
      value: perpendicularSpeedMPerS,
    });
  }
  const q = s.chargeNumber * ELEMENTARY_CHARGE_C;
  const omega = (Math.abs(q) * fieldTesla) / s.massKg;
  return larmorPowerW(q, omega * perpendicularSpeedMPerS);
}

/**
 * Relativistic power of a charge gyrating in a static field (Liénard's generalisation of Larmor for
 * acceleration perpendicular to velocity, Jackson §14.2): P = q²γ⁴a²/(6πε₀c³) with a = ω_c·v⊥ and
 * ω_c = |q|B/(γm), i.e. P = q⁴B²γ²v⊥²/(6πε₀m²c³). For electrons this equals 2σ_T·c·U_B·β²γ²·sin²α
 * with U_B = B²/(2μ₀) (Rybicki & Lightman, Radiative Processes in Astrophysics, §6.1).
 * @param kineticEnergyJ kinetic energy, 0..1 TeV
 * @param pitchAngleRad angle between velocity and field, 0..π (default π/2: circular orbit)
 */
export function gyroRadiationPowerW(
  species: SpeciesRef,
  fieldTesla: number,
  kineticEnergyJ: number,
  pitchAngleRad = Math.PI / 2,
): number {
  const s = resolveSpecies(species);
  requireFieldTesla(fieldTesla);
  requireKineticEnergyJ(kineticEnergyJ);
  requireInRange(pitchAngleRad, 'pitchAngleRad', 0, Math.PI, 'rad');
  const restJ = s.massKg * C * C;
  const gamma = 1 + kineticEnergyJ / restJ;
  const beta = Math.sqrt(kineticEnergyJ * (kineticEnergyJ + 2 * restJ)) / (kineticEnergyJ + restJ);
  const vPerp = beta * C * Math.sin(pitchAngleRad);
  const q = s.chargeNumber * ELEMENTARY_CHARGE_C;
  const omega = (Math.abs(q) * fieldTesla) / (gamma * s.massKg);
  const a = omega * vPerp;
  return (q * q * gamma ** 4 * a * a) / (6 * Math.PI * EPS0 * C ** 3);
}

/**
 * What the energy input of {@link perVolumeEmissionWPerM3} means:
 * - 'perpendicular': the mean perpendicular kinetic energy ⟨W⊥⟩ itself;
 * - 'temperature': k·Tₑ of a Maxwellian, for which ⟨W⊥⟩ = k·Tₑ (two degrees of freedom);
 * - 'totalIsotropic': the mean TOTAL kinetic energy ⟨W⟩ of an isotropic plasma; ⟨W⊥⟩ = (2/3)·⟨W⟩.
 */
export type EmissionEnergyKind = 'perpendicular' | 'temperature' | 'totalIsotropic';

/** Input of {@link perVolumeEmissionWPerM3}. */
export interface PerVolumeEmissionInput {
  /** Number density of the radiating species, m⁻³ (> 0). */
  readonly densityPerM3: number;
  readonly fieldTesla: number;
  /** Energy in J; its meaning is set by `energyKind` — there is no default, on purpose. */
  readonly energyJ: number;
  readonly energyKind: EmissionEnergyKind;
  /** Radiating species; default electron (ions radiate (mₑ/mᵢ)² less at equal energy). */
  readonly species?: SpeciesRef;
}

/** Result of {@link perVolumeEmissionWPerM3}. */
export interface PerVolumeEmission {
  readonly powerPerVolumeWPerM3: number;
  /** The ⟨W⊥⟩ actually used, J. */
  readonly meanPerpendicularEnergyJ: number;
}

/** ⟨W⊥⟩ from an energy input and its kind (see {@link EmissionEnergyKind}). */
export function meanPerpendicularEnergyJ(energyJ: number, energyKind: EmissionEnergyKind): number {
  requireNonNegative(energyJ, 'energyJ');
  switch (energyKind) {
    case 'perpendicular':
    case 'temperature':
      return energyJ;
    case 'totalIsotropic':
      return (2 / 3) * energyJ;
    default:
      throw new PhysicsInputError('INVALID_INPUT', 'energyKind must be perpendicular, temperature or totalIsotropic.', {
        field: 'energyKind',
        value: energyKind,
      });
  }
}

/**
 * Per-volume cyclotron power of an optically thin, non-relativistic plasma, in W/m³:
 * P/V = n·Σ P_Larmor = n·q⁴B²⟨W⊥⟩/(3πε₀m³c³) (from Larmor with v⊥² = 2W⊥/m; Jackson §14.2).
 * For electrons with ⟨W⊥⟩ in eV this is 6.21e-20·nₑ·B²·⟨W⊥⟩ — NOT the NRL formulary's 6.21e-28,
 * which is for cgs-practical inputs.
 */
export function perVolumeEmissionWPerM3(input: PerVolumeEmissionInput): PerVolumeEmission {
  const s = resolveSpecies(input.species ?? 'electron');
  requirePositive(input.densityPerM3, 'densityPerM3');
  requireFieldTesla(input.fieldTesla);
  const wPerp = meanPerpendicularEnergyJ(input.energyJ, input.energyKind);
  const restJ = s.massKg * C * C;
  if (wPerp > PER_VOLUME_MAX_ENERGY_OVER_REST * restJ) {
    throw new PhysicsInputError(
      'OUT_OF_RANGE',
      `The plasma emission law is non-relativistic: the mean perpendicular energy must not exceed ` +
        `${((PER_VOLUME_MAX_ENERGY_OVER_REST * restJ) / ELECTRON_VOLT_J).toPrecision(3)} eV for this species.`,
      { field: 'energyJ', value: input.energyJ },
    );
  }
  const q = s.chargeNumber * ELEMENTARY_CHARGE_C;
  const perParticleW = (q ** 4 * input.fieldTesla ** 2 * wPerp) / (3 * Math.PI * EPS0 * s.massKg ** 3 * C ** 3);
  return { powerPerVolumeWPerM3: input.densityPerM3 * perParticleW, meanPerpendicularEnergyJ: wPerp };
}

/**
 * Total power of an emitter volume, W = (P/V)·V, with P/V from {@link perVolumeEmissionWPerM3}
 * (uniform density, field and energy over the volume; split a non-uniform emitter into parts).
 */
export function totalEmissionPowerW(input: PerVolumeEmissionInput & { readonly volumeM3: number }): number {
  requirePositive(input.volumeM3, 'volumeM3');
  return perVolumeEmissionWPerM3(input).powerPerVolumeWPerM3 * input.volumeM3;
}

/**
 * Free-space power flux density at distance d from an isotropic emitter, S = P/(4πd²) in W/m²
 * (inverse-square law; Balanis, Antenna Theory, ch. 2 — far field only).
 */
export function isotropicFluxDensityWPerM2(powerW: number, distanceM: number): number {
  requireNonNegative(powerW, 'powerW');
  requirePositive(distanceM, 'distanceM');
  return powerW / (4 * Math.PI * distanceM * distanceM);
}

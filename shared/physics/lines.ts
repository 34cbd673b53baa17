/**
 * Cyclotron lines: the frequencies at which a charged particle gyrating in a static field radiates.
 *
 *   ω_c = |q|B/(γm)   [rad/s]        f_c = ω_c/(2π) = |q|B/(2πγm)   [Hz]        line n: n·f_c
 *
 * Source: Jackson, Classical Electrodynamics, 3rd ed., §12.2 (motion in a uniform static field,
 * ω_B = eBc/(γmc²) in Gaussian form); NRL Plasma Formulary (J. D. Huba, 2019), f_ce = 2.80e6·B[G] Hz,
 * f_ci = 1.52e3·Z·μ⁻¹·B[G] Hz. Electron ≈ 27.99 GHz/T, proton ≈ 15.245 MHz/T (CODATA 2018).
 *
 * NOT cyclotron lines (a common trap): the electron SPIN resonance 28.025 GHz/T (differs by g/2) and
 * the proton NMR PRECESSION 42.577 MHz/T (differs by μₚ/μ_N ≈ 2.793). The latter is available as
 * {@link protonPrecessionFrequencyHz}, labelled as precession, for an MR scanner's receive band only.
 *
 * Names say which frequency they return: `angular…RadPerS` includes no 2π; `…Hz` is ordinary frequency.
 */

import { ELEMENTARY_CHARGE_C, PROTON_GYROMAGNETIC_RATIO_OVER_2PI_HZ_PER_T } from './constants';
import { PhysicsInputError, requireArray, requireInRange, requireInteger, requireNonNegative } from './errors';
import { requireFieldTesla, requireKineticEnergyJ, resolveSpeciesAndEnergy } from './kinematics';
import { resolveSpecies, type SpeciesRef } from './species';

const TWO_PI = 2 * Math.PI;

/** Highest harmonic number accepted. Harmonics above a few are weaker by ~(v/c)^(2n−2); 100 is generous. */
export const MAX_HARMONIC = 100;

/**
 * Angular cyclotron frequency ω_c = |q|B/(γm) in rad/s (Jackson §12.2). No 2π: see {@link cyclotronFrequencyHz}.
 * @param fieldTesla |B| > 0
 * @param kineticEnergyJ kinetic energy (γ = 1 + E_k/mc²); 0 for the cold, non-relativistic line
 */
export function angularCyclotronFrequencyRadPerS(species: SpeciesRef, fieldTesla: number, kineticEnergyJ = 0): number {
  const { s, gamma } = resolveSpeciesAndEnergy(species, kineticEnergyJ);
  requireFieldTesla(fieldTesla);
  return (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C * fieldTesla) / (gamma * s.massKg);
}

/**
 * Cyclotron frequency f_c = |q|B/(2πγm) in Hz (Jackson §12.2; NRL Plasma Formulary 2019, f_ce, f_ci).
 * The fundamental line (n = 1); harmonics are exact multiples (see {@link harmonicFrequenciesHz}).
 */
export function cyclotronFrequencyHz(species: SpeciesRef, fieldTesla: number, kineticEnergyJ = 0): number {
  return angularCyclotronFrequencyRadPerS(species, fieldTesla, kineticEnergyJ) / TWO_PI;
}

/**
 * Cyclotron frequency per tesla, |q|/(2πγm) in Hz/T: the slope of the line against field.
 * Electron ≈ 27.99 GHz/T, proton ≈ 15.245 MHz/T at rest (CODATA 2018).
 */
export function cyclotronHzPerTesla(species: SpeciesRef, kineticEnergyJ = 0): number {
  const { s, gamma } = resolveSpeciesAndEnergy(species, kineticEnergyJ);
  return (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C) / (TWO_PI * gamma * s.massKg);
}

/**
 * Lines n·f_c for n = 1..harmonicCount, in Hz (index 0 is the fundamental). Exact multiples of f_c —
 * the relativistic mass shift is in f_c itself: the orbit is periodic at ω_c, so its radiation is a
 * Fourier series in n·ω_c (Jackson ch. 14, radiation of a charge in circular motion).
 */
export function harmonicFrequenciesHz(
  species: SpeciesRef,
  fieldTesla: number,
  harmonicCount: number,
  kineticEnergyJ = 0,
): number[] {
  requireInteger(harmonicCount, 'harmonicCount', 1, MAX_HARMONIC);
  const fundamentalHz = cyclotronFrequencyHz(species, fieldTesla, kineticEnergyJ);
  const lines: number[] = [];
  for (let n = 1; n <= harmonicCount; n++) lines.push(n * fundamentalHz);
  return lines;
}

/** A frequency interval [lowHz, highHz]. */
export interface FrequencyBandHz {
  readonly lowHz: number;
  readonly highHz: number;
}

/** Input of {@link lineBandHz}. */
export interface LineBandInput {
  readonly species: SpeciesRef;
  /** Harmonic number n ≥ 1. */
  readonly harmonic: number;
  /** Smallest |B| seen (e.g. over the stations of a room), > 0. */
  readonly fieldMinTesla: number;
  /** Largest |B| seen, ≥ fieldMinTesla. */
  readonly fieldMaxTesla: number;
  /** Instrument's relative uncertainty of |B| (e.g. 0.03 for ±3 %), 0 ≤ u < 1. Widens the field interval. */
  readonly relativeUncertainty?: number;
  /** Kinetic-energy interval of the particles; higher energy gives lower frequency. Default 0..0. */
  readonly kineticEnergyMinJ?: number;
  readonly kineticEnergyMaxJ?: number;
}

/**
 * Band of line n for a field interval: [n·f_c(B_min·(1−u), E_max), n·f_c(B_max·(1+u), E_min)] in Hz, with
 * f_c = |q|B/(2πγm) (Jackson §12.2). The field interval is widened by the instrument's relative
 * uncertainty u; the energy interval moves the low edge down through γ.
 */
export function lineBandHz(input: LineBandInput): FrequencyBandHz {
  const s = resolveSpecies(input.species);
  requireInteger(input.harmonic, 'harmonic', 1, MAX_HARMONIC);
  requireFieldTesla(input.fieldMinTesla, 'fieldMinTesla');
  requireFieldTesla(input.fieldMaxTesla, 'fieldMaxTesla');
  if (input.fieldMaxTesla < input.fieldMinTesla) {
    throw new PhysicsInputError('INVALID_INPUT', 'The largest field must not be below the smallest field.', {
      field: 'fieldMaxTesla',
      value: input.fieldMaxTesla,
    });
  }
  const u = input.relativeUncertainty ?? 0;
  requireRelativeUncertainty(u);
  const eMin = requireKineticEnergyJ(input.kineticEnergyMinJ ?? 0, 'kineticEnergyMinJ');
  const eMax = requireKineticEnergyJ(input.kineticEnergyMaxJ ?? eMin, 'kineticEnergyMaxJ');
  if (eMax < eMin) {
    throw new PhysicsInputError('INVALID_INPUT', 'The largest energy must not be below the smallest energy.', {
      field: 'kineticEnergyMaxJ',
      value: eMax,
    });
  }
  const qOver2pim = (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C) / (TWO_PI * s.massKg);
  const n = input.harmonic;
  return {
    lowHz: (n * qOver2pim * input.fieldMinTesla * (1 - u)) / resolveSpeciesAndEnergy(s, eMax).gamma,
    highHz: (n * qOver2pim * input.fieldMaxTesla * (1 + u)) / resolveSpeciesAndEnergy(s, eMin).gamma,
  };
}

/** Validates a relative uncertainty 0 ≤ u < 1. */
export function requireRelativeUncertainty(relativeUncertainty: number, name = 'relativeUncertainty'): number {
  requireNonNegative(relativeUncertainty, name);
  return requireInRange(relativeUncertainty, name, 0, 0.999_999, '');
}

/**
 * Array form of {@link cyclotronFrequencyHz}: f_c = |q|B/(2πγm) for every field in `fieldsTesla`.
 * Validates every field (> 0, finite) first; writes into `out` if given (same length), else a new array.
 */
export function cyclotronFrequenciesHz(
  species: SpeciesRef,
  fieldsTesla: Float64Array,
  kineticEnergyJ = 0,
  out?: Float64Array,
): Float64Array {
  const hzPerTesla = cyclotronHzPerTesla(species, kineticEnergyJ);
  requireArray(fieldsTesla, 'fieldsTesla', 'positive');
  const result = out ?? new Float64Array(fieldsTesla.length);
  if (result.length !== fieldsTesla.length) {
    throw new PhysicsInputError('LENGTH_MISMATCH', 'The output array must have one slot per field value.', {
      field: 'out',
      value: result.length,
    });
  }
  for (let i = 0; i < fieldsTesla.length; i++) result[i] = hzPerTesla * (fieldsTesla[i] as number);
  return result;
}

/**
 * Array form of {@link lineBandHz} for single stations: for station i, line n spans
 * [n·f_c(B_i(1−u_i)), n·f_c(B_i(1+u_i))] in Hz. `relativeUncertainty` is one value or one per station.
 */
export function stationLineBandsHz(
  species: SpeciesRef,
  fieldsTesla: Float64Array,
  harmonic: number,
  relativeUncertainty: number | Float64Array,
  kineticEnergyJ = 0,
): { lowHz: Float64Array; highHz: Float64Array } {
  requireInteger(harmonic, 'harmonic', 1, MAX_HARMONIC);
  const hzPerTesla = harmonic * cyclotronHzPerTesla(species, kineticEnergyJ);
  requireArray(fieldsTesla, 'fieldsTesla', 'positive');
  const count = fieldsTesla.length;
  const lowHz = new Float64Array(count);
  const highHz = new Float64Array(count);
  if (typeof relativeUncertainty === 'number') {
    requireRelativeUncertainty(relativeUncertainty);
    for (let i = 0; i < count; i++) {
      const f = hzPerTesla * (fieldsTesla[i] as number);
      lowHz[i] = f * (1 - relativeUncertainty);
      highHz[i] = f * (1 + relativeUncertainty);
    }
  } else {
    if (relativeUncertainty.length !== count) {
      throw new PhysicsInputError('LENGTH_MISMATCH', 'Give one relative uncertainty per station.', {
        field: 'relativeUncertainty',
        value: relativeUncertainty.length,
      });
    }
    for (let i = 0; i < count; i++) requireRelativeUncertainty(relativeUncertainty[i] as number, `relativeUncertainty[${i}]`);
    for (let i = 0; i < count; i++) {
      const f = hzPerTesla * (fieldsTesla[i] as number);
      const u = relativeUncertainty[i] as number;
      lowHz[i] = f * (1 - u);
      highHz[i] = f * (1 + u);
    }
  }
  return { lowHz, highHz };
}

/**
 * Proton NMR PRECESSION (Larmor) frequency f = (γₚ/2π)·B with γₚ/2π = 42.577 478 518 MHz/T (CODATA 2018).
 *
 * NOT a cyclotron line. This is what an MR scanner transmits and receives at; use it only to place a
 * scanner's receive band, and label it "precession". It exceeds the proton cyclotron frequency by
 * μₚ/μ_N ≈ 2.793.
 */
export function protonPrecessionFrequencyHz(fieldTesla: number): number {
  requireFieldTesla(fieldTesla);
  return PROTON_GYROMAGNETIC_RATIO_OVER_2PI_HZ_PER_T * fieldTesla;
}

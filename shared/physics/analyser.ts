/**
 * Spectrum-analyser and antenna arithmetic for checking measured peaks against predicted lines.
 *
 *   P[W] = 10^((P[dBm] − 30)/10)                    P[dBW] = P[dBm] − 30
 *   V[dBµV] = P[dBm] + 90 + 10·log₁₀(R/Ω)           = P[dBm] + 106.99 at 50 Ω
 *   E[dBµV/m] = V[dBµV] + AF[dB/m] + cable loss[dB]
 *   AF = E/V = √(4πZ₀/(R·G·λ²))                     = 20·log₁₀(f/MHz) − G[dBi] − 29.77 dB at 50 Ω
 *   S = E²/Z₀                                       S[dBW/m²] = E[dBµV/m] − 145.76
 *   DANL at RBW: N[dBm] = DANL[dBm @ B_ref] + 10·log₁₀(RBW/B_ref)
 *   A_e = G·λ²/(4π),  P_r = S·A_e;  far field beyond 2D²/λ
 *
 * Sources: Balanis, Antenna Theory (effective aperture, Friis, far-field distance); CISPR 16-1-x and
 * IEEE Std 291 (field-strength measurement with antenna factor); the analyser noise-floor scaling with
 * resolution bandwidth as in common analyser application notes (recalled). Z₀ from CODATA 2018.
 */

import { SPEED_OF_LIGHT_M_PER_S, VACUUM_IMPEDANCE_OHM } from './constants';
import { requireFinite, requireInRange, requireNonNegative, requirePositive } from './errors';

/** Default analyser input impedance, Ω. */
export const DEFAULT_IMPEDANCE_OHM = 50;

function requireDb(value: number, name: string): number {
  return requireInRange(value, name, -400, 400, 'dB');
}

function requireGainDbi(gainDbi: number): number {
  return requireInRange(gainDbi, 'gainDbi', -60, 80, 'dBi');
}

function requireImpedance(impedanceOhm: number): number {
  requirePositive(impedanceOhm, 'impedanceOhm');
  return requireInRange(impedanceOhm, 'impedanceOhm', 1e-3, 1e6, 'Ω');
}

/** P[W] = 10^((P[dBm] − 30)/10) (definition of dBm: decibels relative to 1 mW). */
export function dbmToWatts(powerDbm: number): number {
  requireDb(powerDbm, 'powerDbm');
  return 10 ** ((powerDbm - 30) / 10);
}

/** P[dBm] = 10·log₁₀(P/1 mW); P > 0. */
export function wattsToDbm(powerW: number): number {
  requirePositive(powerW, 'powerW');
  return 10 * Math.log10(powerW) + 30;
}

/** P[W] = 10^(P[dBW]/10) (decibels relative to 1 W). */
export function dbwToWatts(powerDbw: number): number {
  requireDb(powerDbw, 'powerDbw');
  return 10 ** (powerDbw / 10);
}

/** P[dBW] = 10·log₁₀(P/1 W); P > 0. */
export function wattsToDbw(powerW: number): number {
  requirePositive(powerW, 'powerW');
  return 10 * Math.log10(powerW);
}

/** dBµV − dBm at impedance R: 10·log₁₀(R·1 mW/(1 µV)²) = 90 + 10·log₁₀(R) dB (106.99 dB at 50 Ω). */
export function dbuvMinusDbm(impedanceOhm = DEFAULT_IMPEDANCE_OHM): number {
  requireImpedance(impedanceOhm);
  return 90 + 10 * Math.log10(impedanceOhm);
}

/** V[dBµV] → P[dBm] across R: P = V²/R, so dBm = dBµV − (90 + 10·log₁₀R); at 50 Ω dBm = dBµV − 106.99. */
export function dbuvToDbm(levelDbuv: number, impedanceOhm = DEFAULT_IMPEDANCE_OHM): number {
  requireDb(levelDbuv, 'levelDbuv');
  return levelDbuv - dbuvMinusDbm(impedanceOhm);
}

/** P[dBm] → V[dBµV] across R (inverse of {@link dbuvToDbm}); at 50 Ω dBµV = dBm + 106.99. */
export function dbmToDbuv(levelDbm: number, impedanceOhm = DEFAULT_IMPEDANCE_OHM): number {
  requireDb(levelDbm, 'levelDbm');
  return levelDbm + dbuvMinusDbm(impedanceOhm);
}

/**
 * Field strength from an analyser reading: E[dBµV/m] = V[dBµV] + AF[dB/m] + cable loss[dB]
 * (CISPR 16-1-x / IEEE Std 291 practice; cable loss ≥ 0 is added back).
 */
export function fieldStrengthDbuvPerM(levelDbuv: number, antennaFactorDbPerM: number, cableLossDb = 0): number {
  requireDb(levelDbuv, 'levelDbuv');
  requireDb(antennaFactorDbPerM, 'antennaFactorDbPerM');
  requireNonNegative(cableLossDb, 'cableLossDb');
  return levelDbuv + antennaFactorDbPerM + cableLossDb;
}

/** As {@link fieldStrengthDbuvPerM} for an analyser level in dBm: E = (P[dBm] + 90 + 10·log₁₀R) + AF + loss. */
export function fieldStrengthFromDbmDbuvPerM(
  levelDbm: number,
  antennaFactorDbPerM: number,
  cableLossDb = 0,
  impedanceOhm = DEFAULT_IMPEDANCE_OHM,
): number {
  return fieldStrengthDbuvPerM(dbmToDbuv(levelDbm, impedanceOhm), antennaFactorDbPerM, cableLossDb);
}

/** Free-space wavelength λ = c/f in metres. */
export function wavelengthM(frequencyHz: number): number {
  requirePositive(frequencyHz, 'frequencyHz');
  return SPEED_OF_LIGHT_M_PER_S / frequencyHz;
}

/**
 * Antenna factor AF = E/V = √(4πZ₀/(R·G·λ²)) in dB/m (from A_e = Gλ²/4π and P = V²/R; Balanis).
 * At 50 Ω this is the handbook rule AF = 20·log₁₀(f/MHz) − G[dBi] − 29.77.
 */
export function antennaFactorDbPerM(frequencyHz: number, gainDbi: number, impedanceOhm = DEFAULT_IMPEDANCE_OHM): number {
  const lambda = wavelengthM(frequencyHz);
  requireGainDbi(gainDbi);
  requireImpedance(impedanceOhm);
  const gain = 10 ** (gainDbi / 10);
  return 10 * Math.log10((4 * Math.PI * VACUUM_IMPEDANCE_OHM) / (impedanceOhm * gain * lambda * lambda));
}

/** Power flux density S = E²/Z₀ in W/m² from field strength E in V/m (plane wave, far field). */
export function fluxDensityFromFieldStrengthWPerM2(fieldStrengthVPerM: number): number {
  requireNonNegative(fieldStrengthVPerM, 'fieldStrengthVPerM');
  return (fieldStrengthVPerM * fieldStrengthVPerM) / VACUUM_IMPEDANCE_OHM;
}

/** Field strength E = √(S·Z₀) in V/m from power flux density S in W/m² (plane wave, far field). */
export function fieldStrengthFromFluxDensityVPerM(fluxDensityWPerM2: number): number {
  requireNonNegative(fluxDensityWPerM2, 'fluxDensityWPerM2');
  return Math.sqrt(fluxDensityWPerM2 * VACUUM_IMPEDANCE_OHM);
}

/** S[dBW/m²] = E[dBµV/m] − 120 − 10·log₁₀(Z₀/Ω) = E[dBµV/m] − 145.76. */
export function fluxDensityDbwPerM2FromDbuvPerM(fieldStrengthDbuvPerM: number): number {
  requireDb(fieldStrengthDbuvPerM, 'fieldStrengthDbuvPerM');
  return fieldStrengthDbuvPerM - 120 - 10 * Math.log10(VACUUM_IMPEDANCE_OHM);
}

/** E[dBµV/m] = S[dBW/m²] + 120 + 10·log₁₀(Z₀/Ω) (inverse of {@link fluxDensityDbwPerM2FromDbuvPerM}). */
export function dbuvPerMFromFluxDensityDbwPerM2(fluxDensityDbwPerM2: number): number {
  requireDb(fluxDensityDbwPerM2, 'fluxDensityDbwPerM2');
  return fluxDensityDbwPerM2 + 120 + 10 * Math.log10(VACUUM_IMPEDANCE_OHM);
}

/**
 * Displayed noise floor at a resolution bandwidth: N[dBm] = DANL + 10·log₁₀(k·RBW/B_ref), where DANL is
 * specified at B_ref (1 Hz when given in dBm/Hz) and k is the filter's noise-bandwidth-to-RBW ratio
 * (≈1.06 for Gaussian filters; default 1). Thermal noise scales with bandwidth (kTB).
 */
export function displayedNoiseFloorDbm(
  danlDbm: number,
  rbwHz: number,
  danlReferenceBandwidthHz = 1,
  noiseBandwidthRatio = 1,
): number {
  requireDb(danlDbm, 'danlDbm');
  requirePositive(rbwHz, 'rbwHz');
  requirePositive(danlReferenceBandwidthHz, 'danlReferenceBandwidthHz');
  requireInRange(noiseBandwidthRatio, 'noiseBandwidthRatio', 0.5, 2);
  return danlDbm + 10 * Math.log10((noiseBandwidthRatio * rbwHz) / danlReferenceBandwidthHz);
}

/** Effective aperture A_e = G·λ²/(4π) in m² (Balanis, Antenna Theory, "Effective aperture"). */
export function effectiveApertureM2(frequencyHz: number, gainDbi: number): number {
  const lambda = wavelengthM(frequencyHz);
  requireGainDbi(gainDbi);
  return (10 ** (gainDbi / 10) * lambda * lambda) / (4 * Math.PI);
}

/** Received power P_r = S·A_e = S·G·λ²/(4π) in W, matched and polarisation-aligned (Balanis; Friis). */
export function receivedPowerW(fluxDensityWPerM2: number, frequencyHz: number, gainDbi: number): number {
  requireNonNegative(fluxDensityWPerM2, 'fluxDensityWPerM2');
  return fluxDensityWPerM2 * effectiveApertureM2(frequencyHz, gainDbi);
}

/** Far-field (Fraunhofer) distance 2D²/λ in metres for an antenna of largest dimension D (Balanis). */
export function farFieldDistanceM(largestDimensionM: number, frequencyHz: number): number {
  requirePositive(largestDimensionM, 'largestDimensionM');
  return (2 * largestDimensionM * largestDimensionM) / wavelengthM(frequencyHz);
}

/** Voltage in dBµV: 20·log₁₀(V/1 µV); V > 0. */
export function voltsToDbuv(voltageV: number): number {
  requirePositive(voltageV, 'voltageV');
  return 20 * Math.log10(voltageV / 1e-6);
}

/** Voltage from dBµV: V = 1 µV·10^(dBµV/20). */
export function dbuvToVolts(levelDbuv: number): number {
  requireDb(levelDbuv, 'levelDbuv');
  requireFinite(levelDbuv, 'levelDbuv');
  return 1e-6 * 10 ** (levelDbuv / 20);
}

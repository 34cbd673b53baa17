/**
 * What a room's stray field predicts (issue 8 §2–§3), as pure functions the server's flag job and the
 * screens share:
 *
 * - The room's field interval: over the readings taken at its stations, [min Bᵢ(1 − Uᵢ), max Bᵢ(1 + Uᵢ)],
 *   where Uᵢ is the reading's EXPANDED relative uncertainty, k·u with k = 2 (JCGM 100:2008 §6.3;
 *   recalled) and u the gaussmeter's relative standard uncertainty (2 % when the instrument states none:
 *   common practice for a handheld Hall or fluxgate meter, recalled — the same figures the repeat-reading
 *   check uses).
 * - Each species' cyclotron line at harmonic n over that interval: [n·f(B_low), n·f(B_high)] with
 *   f = |q|B/(2πm) (cold, non-relativistic; Jackson §12.2), so a band, not a single frequency.
 * - Where those bands touch a watch band (closed intervals, shared/physics/bands.ts bandOverlap).
 * - For a room with a plasma emitter, the power of the fundamental electron line (Larmor, per-volume
 *   law of shared/physics/emission.ts, at the room's highest field: the worst case), its power flux
 *   density at a victim distance (inverse square, isotropic, far field) and, spread over the predicted
 *   band, its spectral flux density against the watch band's threshold, and what a reference analyser
 *   at the victim would receive in one RBW against its noise floor. Harmonics n ≥ 2 radiate weaker
 *   by about (v⊥/c)^(2(n−1)) and are not estimated.
 */
import { ELECTRON_VOLT_J } from '../physics/constants';
import { displayedNoiseFloorDbm, effectiveApertureM2, wattsToDbm } from '../physics/analyser';
import { bandOverlap } from '../physics/bands';
import { isotropicFluxDensityWPerM2, perVolumeEmissionWPerM3 } from '../physics/emission';
import { cyclotronFrequencyHz } from '../physics/lines';
import type { BuiltInSpeciesId } from '../physics/species';

/** GUM coverage factor (JCGM 100:2008 §6.3; recalled). */
export const EMC_COVERAGE_FACTOR_K = 2;
/** Relative standard uncertainty of a gaussmeter that states none (common practice; recalled). */
export const EMC_DEFAULT_RELATIVE_STANDARD_UNCERTAINTY = 0.02;
/** Distance to the victim receiver used when none is chosen, m (a room or two away; common practice). */
export const DEFAULT_VICTIM_DISTANCE_M = 10;
/**
 * The analyser a flag is compared with when its band names no threshold: displayed average noise level
 * −150 dBm/Hz (a general-purpose analyser without preamplifier; recalled from memory, typical data-sheet
 * figures are −145 to −155 dBm/Hz), at a 100 kHz resolution bandwidth (common practice for a survey
 * sweep), with an isotropic 0 dBi antenna at the victim.
 */
export const REFERENCE_ANALYSER = Object.freeze({ danlDbmPerHz: -150, rbwHz: 100e3, antennaGainDbi: 0 });

export interface RoomReading {
  fieldT: number;
  /** The gaussmeter's relative standard uncertainty, or null when it states none. */
  relativeStandardUncertainty: number | null;
}

export interface FieldInterval {
  lowT: number;
  highT: number;
  /** The highest |B| read, before widening (the emission estimate's field). */
  maxReadT: number;
  readings: number;
}

/** The expanded relative uncertainty of one reading, k·u. */
export function expandedRelativeUncertainty(relativeStandardUncertainty: number | null): number {
  const u = relativeStandardUncertainty ?? EMC_DEFAULT_RELATIVE_STANDARD_UNCERTAINTY;
  return Math.min(0.99, EMC_COVERAGE_FACTOR_K * u);
}

/** The field interval of a room's readings, or null with no usable reading (|B| > 0 and finite). */
export function roomFieldInterval(readings: readonly RoomReading[]): FieldInterval | null {
  let lowT = Number.POSITIVE_INFINITY;
  let highT = 0;
  let maxReadT = 0;
  let count = 0;
  for (const r of readings) {
    if (!(r.fieldT > 0) || !Number.isFinite(r.fieldT)) continue;
    const U = expandedRelativeUncertainty(r.relativeStandardUncertainty);
    lowT = Math.min(lowT, r.fieldT * (1 - U));
    highT = Math.max(highT, r.fieldT * (1 + U));
    maxReadT = Math.max(maxReadT, r.fieldT);
    count++;
  }
  return count === 0 ? null : { lowT, highT, maxReadT, readings: count };
}

export interface PredictedBand {
  species: BuiltInSpeciesId;
  harmonic: number;
  lowHz: number;
  highHz: number;
}

/** Every species × harmonic band over a field interval, lowest harmonic first per species. */
export function predictedBands(interval: Pick<FieldInterval, 'lowT' | 'highT'>, species: readonly BuiltInSpeciesId[], maxHarmonic: number): PredictedBand[] {
  const out: PredictedBand[] = [];
  for (const s of species) {
    const fLow = cyclotronFrequencyHz(s, interval.lowT);
    const fHigh = cyclotronFrequencyHz(s, interval.highT);
    for (let n = 1; n <= maxHarmonic; n++) out.push({ species: s, harmonic: n, lowHz: n * fLow, highHz: n * fHigh });
  }
  return out;
}

export interface BandLike {
  id: string;
  lowerHz: number;
  upperHz: number;
}

export interface BandHit<B extends BandLike> {
  line: PredictedBand;
  band: B;
  /** The intersection of the predicted band with the watch band, Hz (a point when they only touch). */
  overlapLowHz: number;
  overlapHighHz: number;
}

/** Each predicted band against each watch band: the pairs that touch or overlap (closed intervals). */
export function bandHits<B extends BandLike>(lines: readonly PredictedBand[], bands: readonly B[]): BandHit<B>[] {
  const hits: BandHit<B>[] = [];
  for (const line of lines) {
    for (const band of bands) {
      if (!bandOverlap(line, { lowHz: band.lowerHz, highHz: band.upperHz }).hit) continue;
      hits.push({ line, band, overlapLowHz: Math.max(line.lowHz, band.lowerHz), overlapHighHz: Math.min(line.highHz, band.upperHz) });
    }
  }
  return hits;
}

export interface EmitterInput {
  name: string;
  electronDensityPerM3: number;
  electronEnergyEv: number;
  energyKind: 'total' | 'perpendicular';
  volumeM3: number;
}

export interface EmissionAtVictim {
  /** Field the emission is computed at, T (the room's highest reading). */
  fieldT: number;
  emittedPowerW: number;
  victimDistanceM: number;
  /** S = P/(4πd²), W/m². */
  fluxDensityWPerM2: number;
  /** S spread evenly over the predicted band's width, dB(W/(m²·Hz)). */
  spectralFluxDensityDbWPerM2Hz: number;
  /** The watch band's threshold, dB(W/(m²·Hz)), when it has one. */
  thresholdDbWPerM2Hz: number | null;
  /** spectral − threshold, dB: above 0 the band's threshold is exceeded at the victim. */
  marginDb: number | null;
  /** What the reference analyser (REFERENCE_ANALYSER) would receive in one RBW at the victim, dBm. */
  receivedInRbwDbm: number;
  /** Its displayed noise floor at that RBW, dBm. */
  analyserNoiseFloorDbm: number;
  /** received − noise floor, dB: above 0 the line would stand out on the analyser. */
  noiseMarginDb: number;
}

/**
 * The victim-dependent figures for an emitted power: S = P/(4πd²) (Balanis ch. 2), spread evenly over
 * the predicted band; against the band's threshold; and received by the reference analyser through an
 * antenna of effective aperture Gλ²/(4π) at the line's centre, in one RBW (all of it when the line is
 * narrower), against its noise floor DANL + 10·log₁₀(RBW/1 Hz).
 */
export function atVictim(emittedPowerW: number, fieldT: number, line: Pick<PredictedBand, 'lowHz' | 'highHz'>, victimDistanceM: number, thresholdDbWPerM2Hz: number | null): EmissionAtVictim {
  const fluxDensityWPerM2 = isotropicFluxDensityWPerM2(emittedPowerW, victimDistanceM);
  const widthHz = Math.max(line.highHz - line.lowHz, 1);
  const spectralFluxDensityDbWPerM2Hz = 10 * Math.log10(fluxDensityWPerM2 / widthHz);
  const centreHz = Math.sqrt(line.lowHz * line.highHz);
  const { danlDbmPerHz, rbwHz, antennaGainDbi } = REFERENCE_ANALYSER;
  const receivedW = fluxDensityWPerM2 * effectiveApertureM2(centreHz, antennaGainDbi) * Math.min(1, rbwHz / widthHz);
  const receivedInRbwDbm = receivedW > 0 ? wattsToDbm(receivedW) : Number.NEGATIVE_INFINITY;
  const analyserNoiseFloorDbm = displayedNoiseFloorDbm(danlDbmPerHz, rbwHz);
  return {
    fieldT,
    emittedPowerW,
    victimDistanceM,
    fluxDensityWPerM2,
    spectralFluxDensityDbWPerM2Hz,
    thresholdDbWPerM2Hz,
    marginDb: thresholdDbWPerM2Hz === null ? null : spectralFluxDensityDbWPerM2Hz - thresholdDbWPerM2Hz,
    receivedInRbwDbm,
    analyserNoiseFloorDbm,
    noiseMarginDb: receivedInRbwDbm - analyserNoiseFloorDbm,
  };
}

/**
 * The fundamental electron line of a room's emitters at a victim distance (see the module comment).
 * Null when the line is not the electron fundamental or the room has no emitter.
 */
export function emissionAtVictim(input: {
  line: PredictedBand;
  emitters: readonly EmitterInput[];
  fieldT: number;
  victimDistanceM: number;
  thresholdDbWPerM2Hz: number | null;
}): EmissionAtVictim | null {
  if (input.line.species !== 'electron' || input.line.harmonic !== 1 || input.emitters.length === 0) return null;
  let emittedPowerW = 0;
  for (const e of input.emitters) {
    const { powerPerVolumeWPerM3 } = perVolumeEmissionWPerM3({
      densityPerM3: e.electronDensityPerM3,
      fieldTesla: input.fieldT,
      energyJ: e.electronEnergyEv * ELECTRON_VOLT_J,
      energyKind: e.energyKind === 'total' ? 'totalIsotropic' : 'perpendicular',
    });
    emittedPowerW += powerPerVolumeWPerM3 * e.volumeM3;
  }
  return atVictim(emittedPowerW, input.fieldT, input.line, input.victimDistanceM, input.thresholdDbWPerM2Hz);
}

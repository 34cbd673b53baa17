/**
 * Sweeps explained (issue 8 §4): peaks found in a sweep's trace, and every peak (marker or trace peak)
 * matched to the predicted cyclotron lines.
 *
 * Peak-finding rule ({@link findTracePeaks}), stated once so the engineer can repeat it by hand:
 *   1. Noise floor = the median level of the trace (dBm). The median ignores the few bins that carry
 *      signals, so it tracks the displayed noise (common practice for automatic peak search).
 *   2. Threshold = floor + max(10 dB, 6 · σ), with σ = 1.4826 · MAD (median absolute deviation of the
 *      levels from the floor; 1.4826 makes MAD a consistent estimate of a normal σ). A noisy trace
 *      raises the threshold instead of reporting noise as peaks. 10 dB is common practice; 6σ keeps
 *      noise excursions out (for normal noise a 6σ excursion has probability ≈ 1e-9 per bin).
 *   3. A peak is a local maximum (higher than the bin before it, not lower than the bin after it — the
 *      first bin of a flat top) at or above the threshold, whose prominence is at least 6 dB.
 *      Prominence = the peak's level minus the higher of the two lowest levels met walking left and
 *      right until a higher bin (or the trace's end). 6 dB is the usual default of an analyser's "peak
 *      excursion" setting (common practice, recalled).
 *   4. Peaks closer than max(RBW, 2 bin spacings) are one peak: the highest is kept. Two signals closer
 *      than the RBW are not resolved by the analyser anyway.
 *   5. At most `maxPeaks` (default 50) are kept, highest first, then listed by frequency.
 *
 * Matching rule ({@link explainPeaks}): a peak at f is explained by a predicted line [lowHz, highHz]
 * (the field interval at the station or room widened by the gaussmeter uncertainty, see
 * shared/physics/lines.ts lineBandHz) when
 *     lowHz − tol ≤ f ≤ highHz + tol,   tol = RBW/2 + bin/2 + a·f
 * where RBW/2 is how far from a signal the analyser can show its maximum, bin/2 the trace's frequency
 * resolution (trace peaks only; 0 for markers) and a the analyser's relative frequency accuracy (from its
 * instrument record; see {@link DEFAULT_ANALYSER_RELATIVE_ACCURACY} when there is none). Among several
 * lines the nearest explains the peak (a peak inside a band has distance 0; ties go to the lower
 * harmonic); the others are listed too.
 *
 * Pure: no DOM, no Node APIs.
 */
import { lineBandHz, type FrequencyBandHz } from '../physics/lines';
import type { SpeciesRef } from '../physics/species';
import type { Trace } from './trace-csv';

/** Threshold above the noise floor, dB (common practice). */
export const PEAK_THRESHOLD_DB = 10;
/** Minimum prominence of a peak, dB (common practice: the usual peak-excursion default, recalled). */
export const PEAK_PROMINENCE_DB = 6;
/** The threshold is at least this many robust standard deviations above the floor. */
export const PEAK_NOISE_SIGMAS = 6;
/** Consistency constant of the MAD for normal data (Rousseeuw & Croux 1993: 1/Φ⁻¹(3/4)). */
export const MAD_TO_SIGMA = 1.4826;
export const DEFAULT_MAX_PEAKS = 50;
/**
 * Relative frequency accuracy assumed when the sweep names no analyser or its record gives none: 10 ppm.
 * Recalled, not read from a data sheet: handheld analysers' reference oscillators are specified at a
 * few ppm (ageing per year plus temperature); 10 ppm covers one out of calibration. Common practice.
 */
export const DEFAULT_ANALYSER_RELATIVE_ACCURACY = 1e-5;

export class PeakInputError extends Error {
  override name = 'PeakInputError';
}

export interface TracePeakOptions {
  /** Resolution bandwidth of the sweep, Hz (> 0). */
  readonly rbwHz: number;
  readonly thresholdDb?: number;
  readonly prominenceDb?: number;
  readonly noiseSigmas?: number;
  readonly maxPeaks?: number;
}

export interface TracePeak {
  readonly frequencyHz: number;
  readonly levelDbm: number;
  readonly prominenceDb: number;
  /** The trace's bin spacing around the peak, Hz (its frequency is known to ± half of it). */
  readonly binWidthHz: number;
  /** Index of the peak's bin in the trace. */
  readonly index: number;
}

export interface TracePeakResult {
  readonly noiseFloorDbm: number;
  readonly thresholdDbm: number;
  /** Robust σ of the levels about the floor, dB. */
  readonly noiseSigmaDb: number;
  readonly mergeDistanceHz: number;
  /** Peaks in frequency order. */
  readonly peaks: TracePeak[];
}

function median(values: ArrayLike<number>): number {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  const mid = n >> 1;
  return n % 2 === 1 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

function requireTrace(trace: Trace): void {
  const n = trace.frequencyHz.length;
  if (trace.levelDbm.length !== n) throw new PeakInputError('A trace needs one level per frequency.');
  for (let i = 0; i < n; i++) {
    const f = trace.frequencyHz[i] as number;
    if (!Number.isFinite(f) || f < 0) throw new PeakInputError(`Trace point ${i + 1}: the frequency is not a finite value ≥ 0.`);
    if (!Number.isFinite(trace.levelDbm[i] as number)) throw new PeakInputError(`Trace point ${i + 1}: the level is not a finite number.`);
    if (i > 0 && !(f > (trace.frequencyHz[i - 1] as number))) throw new PeakInputError('Trace frequencies must rise strictly.');
  }
}

function requirePositiveFinite(value: number, name: string): void {
  if (!Number.isFinite(value) || value <= 0) throw new PeakInputError(`${name} must be a finite number above 0.`);
}

/** Finds the peaks of a trace by the rule in this module's docblock. A trace of fewer than 3 points has none. */
export function findTracePeaks(trace: Trace, options: TracePeakOptions): TracePeakResult {
  requireTrace(trace);
  requirePositiveFinite(options.rbwHz, 'RBW');
  const thresholdDb = options.thresholdDb ?? PEAK_THRESHOLD_DB;
  const prominenceDb = options.prominenceDb ?? PEAK_PROMINENCE_DB;
  const noiseSigmas = options.noiseSigmas ?? PEAK_NOISE_SIGMAS;
  const maxPeaks = options.maxPeaks ?? DEFAULT_MAX_PEAKS;
  const f = trace.frequencyHz;
  const level = trace.levelDbm;
  const n = f.length;
  if (n === 0) return { noiseFloorDbm: NaN, thresholdDbm: NaN, noiseSigmaDb: NaN, mergeDistanceHz: options.rbwHz, peaks: [] };

  const floor = median(level);
  const deviations = new Float64Array(n);
  for (let i = 0; i < n; i++) deviations[i] = Math.abs((level[i] as number) - floor);
  const sigma = MAD_TO_SIGMA * median(deviations);
  const threshold = floor + Math.max(thresholdDb, noiseSigmas * sigma);
  const spacings = new Float64Array(Math.max(0, n - 1));
  for (let i = 1; i < n; i++) spacings[i - 1] = (f[i] as number) - (f[i - 1] as number);
  const typicalBinHz = spacings.length > 0 ? median(spacings) : 0;
  const mergeDistanceHz = Math.max(options.rbwHz, 2 * typicalBinHz);

  const candidates: TracePeak[] = [];
  for (let i = 1; i < n - 1; i++) {
    const here = level[i] as number;
    if (here < threshold || !(here > (level[i - 1] as number)) || here < (level[i + 1] as number)) continue;
    // Prominence: the lowest level on each side until a strictly higher bin (or the end).
    let leftMin = here;
    for (let j = i - 1; j >= 0 && (level[j] as number) <= here; j--) leftMin = Math.min(leftMin, level[j] as number);
    let rightMin = here;
    for (let j = i + 1; j < n && (level[j] as number) <= here; j++) rightMin = Math.min(rightMin, level[j] as number);
    const prominence = here - Math.max(leftMin, rightMin);
    if (prominence < prominenceDb) continue;
    const binWidthHz = ((f[i + 1] as number) - (f[i - 1] as number)) / 2;
    candidates.push({ frequencyHz: f[i] as number, levelDbm: here, prominenceDb: prominence, binWidthHz, index: i });
  }
  candidates.sort((a, b) => b.levelDbm - a.levelDbm || a.frequencyHz - b.frequencyHz);
  const kept: TracePeak[] = [];
  for (const c of candidates) {
    if (kept.length >= maxPeaks) break;
    if (kept.every((k) => Math.abs(k.frequencyHz - c.frequencyHz) >= mergeDistanceHz)) kept.push(c);
  }
  kept.sort((a, b) => a.frequencyHz - b.frequencyHz);
  return { noiseFloorDbm: floor, thresholdDbm: threshold, noiseSigmaDb: sigma, mergeDistanceHz, peaks: kept };
}

/** A predicted line band. */
export interface PredictedLine extends FrequencyBandHz {
  readonly species: string;
  readonly harmonic: number;
}

export interface PredictLinesInput {
  readonly species: readonly string[];
  readonly maxHarmonic: number;
  readonly fieldMinTesla: number;
  readonly fieldMaxTesla: number;
  /** Gaussmeter relative uncertainty, widens the field interval (0.01 = ±1 %). */
  readonly relativeUncertainty: number;
}

/** Line bands n = 1..maxHarmonic for each species (lineBandHz, Jackson §12.2), lowest frequency first. */
export function predictLines(input: PredictLinesInput): PredictedLine[] {
  const lines: PredictedLine[] = [];
  for (const species of input.species) {
    for (let harmonic = 1; harmonic <= input.maxHarmonic; harmonic++) {
      const band = lineBandHz({
        species: species as SpeciesRef,
        harmonic,
        fieldMinTesla: input.fieldMinTesla,
        fieldMaxTesla: input.fieldMaxTesla,
        relativeUncertainty: input.relativeUncertainty,
      });
      lines.push({ species, harmonic, lowHz: band.lowHz, highHz: band.highHz });
    }
  }
  return lines.sort((a, b) => a.lowHz - b.lowHz || a.harmonic - b.harmonic);
}

export type PeakSource = 'marker' | 'trace';

export interface PeakToExplain {
  readonly frequencyHz: number;
  readonly levelDbm: number;
  readonly source: PeakSource;
  /** Trace bin spacing at the peak, Hz; absent for markers. */
  readonly binWidthHz?: number;
}

export interface ExplainPeaksInput {
  readonly peaks: readonly PeakToExplain[];
  readonly lines: readonly PredictedLine[];
  readonly rbwHz: number;
  /** Analyser's relative frequency accuracy (1e-6 = 1 ppm); default {@link DEFAULT_ANALYSER_RELATIVE_ACCURACY}. */
  readonly analyserRelativeAccuracy?: number;
}

export interface LineMatch extends PredictedLine {
  /** Distance from the peak to the band, Hz (0 inside). */
  readonly distanceHz: number;
}

export interface ExplainedPeak extends PeakToExplain {
  /** The combined tolerance used for this peak, Hz: RBW/2 + bin/2 + accuracy·f. */
  readonly toleranceHz: number;
  readonly status: 'explained' | 'unexplained';
  readonly explainedBy: LineMatch | null;
  /** Further lines within tolerance (besides explainedBy). */
  readonly alsoWithin: LineMatch[];
  /** "explained by the electron line n = 2 at 2.41–2.47 GHz" or "unexplained". */
  readonly label: string;
}

/** The combined tolerance of a peak at f: RBW/2 + bin/2 + a·f, Hz. */
export function peakToleranceHz(frequencyHz: number, rbwHz: number, relativeAccuracy: number, binWidthHz = 0): number {
  return rbwHz / 2 + binWidthHz / 2 + relativeAccuracy * frequencyHz;
}

/** Matches every peak to the predicted lines within the combined tolerance (rule in the docblock). */
export function explainPeaks(input: ExplainPeaksInput): ExplainedPeak[] {
  requirePositiveFinite(input.rbwHz, 'RBW');
  const accuracy = input.analyserRelativeAccuracy ?? DEFAULT_ANALYSER_RELATIVE_ACCURACY;
  if (!Number.isFinite(accuracy) || accuracy < 0 || accuracy >= 1) throw new PeakInputError('The analyser accuracy must be a relative value from 0 up to 1.');
  return input.peaks.map((peak) => {
    const toleranceHz = peakToleranceHz(peak.frequencyHz, input.rbwHz, accuracy, peak.binWidthHz ?? 0);
    const matches: LineMatch[] = [];
    for (const line of input.lines) {
      if (peak.frequencyHz >= line.lowHz - toleranceHz && peak.frequencyHz <= line.highHz + toleranceHz) {
        const distanceHz = peak.frequencyHz < line.lowHz ? line.lowHz - peak.frequencyHz : peak.frequencyHz > line.highHz ? peak.frequencyHz - line.highHz : 0;
        matches.push({ ...line, distanceHz });
      }
    }
    matches.sort((a, b) => a.distanceHz - b.distanceHz || a.harmonic - b.harmonic);
    const best = matches[0] ?? null;
    return {
      ...peak,
      toleranceHz,
      status: best ? 'explained' : 'unexplained',
      explainedBy: best,
      alsoWithin: matches.slice(1),
      label: best ? `explained by the ${best.species} line n = ${best.harmonic} at ${formatHzRange(best.lowHz, best.highHz)}` : 'unexplained',
    };
  });
}

/**
 * Markers and trace peaks together: a trace peak within `mergeDistanceHz` of a marker is the same
 * signal and is left out (the surveyor's marker stands for it).
 */
export function combinePeaks(markers: readonly { frequencyHz: number; levelDbm: number }[], tracePeaks: readonly TracePeak[], mergeDistanceHz: number): PeakToExplain[] {
  const out: PeakToExplain[] = markers.map((m) => ({ frequencyHz: m.frequencyHz, levelDbm: m.levelDbm, source: 'marker' }));
  for (const p of tracePeaks) {
    if (markers.some((m) => Math.abs(m.frequencyHz - p.frequencyHz) < mergeDistanceHz)) continue;
    out.push({ frequencyHz: p.frequencyHz, levelDbm: p.levelDbm, source: 'trace', binWidthHz: p.binWidthHz });
  }
  return out.sort((a, b) => a.frequencyHz - b.frequencyHz);
}

const UNITS: Array<[number, string]> = [
  [1e9, 'GHz'],
  [1e6, 'MHz'],
  [1e3, 'kHz'],
  [1, 'Hz'],
];

/** "2.41–2.47 GHz": the unit of the upper edge, three significant digits or more until the edges differ. */
export function formatHzRange(lowHz: number, highHz: number): string {
  const [factor, unit] = UNITS.find(([u]) => highHz >= u) ?? [1, 'Hz'];
  let digits = 3;
  let low = '';
  let high = '';
  do {
    low = String(Number((lowHz / factor).toPrecision(digits)));
    high = String(Number((highHz / factor).toPrecision(digits)));
    digits++;
  } while (low === high && lowHz !== highHz && digits <= 12);
  return low === high ? `${high} ${unit}` : `${low}–${high} ${unit}`;
}

/** A frequency with its unit, e.g. "2.449 GHz" (four significant digits). */
export function formatHz(frequencyHz: number): string {
  const [factor, unit] = UNITS.find(([u]) => frequencyHz >= u) ?? [1, 'Hz'];
  return `${Number((frequencyHz / factor).toPrecision(4))} ${unit}`;
}

/**
 * Thins a trace for display to at most `maxPoints` points: the span is cut into maxPoints/2 buckets of
 * equal index count and each keeps its lowest and highest point (in frequency order), so no peak and no
 * dip disappears from the drawing.
 */
export function downsampleMinMax(trace: Trace, maxPoints = 2000): { frequencyHz: number[]; levelDbm: number[] } {
  const n = trace.frequencyHz.length;
  if (maxPoints < 2) throw new PeakInputError('Keep at least 2 points.');
  if (n <= maxPoints) return { frequencyHz: Array.from(trace.frequencyHz), levelDbm: Array.from(trace.levelDbm) };
  const buckets = Math.floor(maxPoints / 2);
  const frequencyHz: number[] = [];
  const levelDbm: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    let lo = start;
    let hi = start;
    for (let i = start + 1; i < end; i++) {
      if ((trace.levelDbm[i] as number) < (trace.levelDbm[lo] as number)) lo = i;
      if ((trace.levelDbm[i] as number) > (trace.levelDbm[hi] as number)) hi = i;
    }
    for (const i of lo === hi ? [lo] : lo < hi ? [lo, hi] : [hi, lo]) {
      frequencyHz.push(trace.frequencyHz[i] as number);
      levelDbm.push(trace.levelDbm[i] as number);
    }
  }
  return { frequencyHz, levelDbm };
}

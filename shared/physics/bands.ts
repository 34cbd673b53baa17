/**
 * Overlap of predicted line bands with watch bands (frequency ranges an organisation protects).
 *
 * Interval logic on closed intervals [low, high] in Hz: two intervals touch when
 * max(low₁, low₂) ≤ min(high₁, high₂). A watch band's optional margin widens it on both sides (a guard
 * band); a line that only reaches into the margin is a hit with `overlapHz` 0 and `gapHz` > 0.
 *
 * The bulk form ({@link findStationBandHits}) sorts the watch bands by low edge and keeps a running
 * maximum of high edges, so each line is a binary search plus a short backward scan — not a pass over
 * every band.
 */

import { ELEMENTARY_CHARGE_C } from './constants';
import { PhysicsInputError, requireArray, requireInteger, requireNonNegative } from './errors';
import { resolveSpeciesAndEnergy } from './kinematics';
import { MAX_HARMONIC, requireRelativeUncertainty, type FrequencyBandHz } from './lines';
import type { SpeciesRef } from './species';

/** A protected frequency range. */
export interface WatchBand {
  readonly id: string;
  readonly name?: string;
  readonly lowHz: number;
  readonly highHz: number;
}

/** Result of comparing one line band with one watch band. */
export interface BandOverlap {
  /** True when the line touches the watch band widened by the margin. */
  readonly hit: boolean;
  /** Width of the intersection with the watch band itself, Hz (0 if disjoint or touching at a point). */
  readonly overlapHz: number;
  /** Share of the line band inside the watch band, 0..1 (1 for a zero-width line inside the band). */
  readonly lineFractionInside: number;
  /** Distance between the line band and the watch band, Hz (0 when they touch or overlap). */
  readonly gapHz: number;
}

function requireBand(band: FrequencyBandHz, name: string): void {
  requireNonNegative(band.lowHz, `${name}.lowHz`);
  requireNonNegative(band.highHz, `${name}.highHz`);
  if (band.highHz < band.lowHz) {
    throw new PhysicsInputError('INVALID_INPUT', `${name}: the upper edge must not be below the lower edge.`, {
      field: `${name}.highHz`,
      value: band.highHz,
    });
  }
}

/**
 * Closed-interval overlap of a line band with a watch band widened by `marginHz` on each side:
 * overlap = max(0, min(h₁,h₂) − max(l₁,l₂)); gap = max(0, max(l₁,l₂) − min(h₁,h₂)); hit ⇔ gap ≤ margin.
 * (Elementary interval arithmetic; the bands are ITU-style allocations, RR Article 5.)
 */
export function bandOverlap(line: FrequencyBandHz, watch: FrequencyBandHz, marginHz = 0): BandOverlap {
  requireBand(line, 'line');
  requireBand(watch, 'watchBand');
  requireNonNegative(marginHz, 'marginHz');
  const lo = Math.max(line.lowHz, watch.lowHz);
  const hi = Math.min(line.highHz, watch.highHz);
  const overlapHz = Math.max(0, hi - lo);
  const gapHz = Math.max(0, lo - hi);
  const lineWidth = line.highHz - line.lowHz;
  const lineFractionInside = lineWidth > 0 ? overlapHz / lineWidth : gapHz === 0 ? 1 : 0;
  return { hit: gapHz <= marginHz, overlapHz, lineFractionInside, gapHz };
}

/** A line band labelled with its species and harmonic. */
export interface LabelledLineBand extends FrequencyBandHz {
  readonly speciesId: string;
  readonly harmonic: number;
}

/** One line hitting one watch band. */
export interface LineBandHit extends BandOverlap {
  readonly speciesId: string;
  readonly harmonic: number;
  readonly watchBandId: string;
  readonly lineLowHz: number;
  readonly lineHighHz: number;
}

/**
 * Which species and harmonic hit which watch band, and by how much ({@link bandOverlap} for each pair).
 * For a room's few dozen lines; use {@link findStationBandHits} for whole surveys.
 */
export function findLineBandHits(
  lines: readonly LabelledLineBand[],
  watchBands: readonly WatchBand[],
  marginHz = 0,
): LineBandHit[] {
  requireNonNegative(marginHz, 'marginHz');
  const hits: LineBandHit[] = [];
  for (const line of lines) {
    for (const band of watchBands) {
      const overlap = bandOverlap(line, band, marginHz);
      if (overlap.hit) {
        hits.push({
          ...overlap,
          speciesId: line.speciesId,
          harmonic: line.harmonic,
          watchBandId: band.id,
          lineLowHz: line.lowHz,
          lineHighHz: line.highHz,
        });
      }
    }
  }
  return hits;
}

/** A species with the kinetic energy its line is computed at (default 0: cold, non-relativistic). */
export type LineSpeciesInput = SpeciesRef | { readonly species: SpeciesRef; readonly kineticEnergyJ?: number };

/** Input of {@link findStationBandHits}. */
export interface StationBandHitsInput {
  /** |B| at each station, T (> 0). */
  readonly fieldsTesla: Float64Array;
  /** Relative uncertainty of each reading (one value or one per station), 0 ≤ u < 1. */
  readonly relativeUncertainty: number | Float64Array;
  readonly species: readonly LineSpeciesInput[];
  /** Harmonics 1..harmonicCount. */
  readonly harmonicCount: number;
  readonly watchBands: readonly WatchBand[];
  readonly marginHz?: number;
}

/** Column-oriented hits (one row per station × species × harmonic × band that touch). */
export interface StationBandHits {
  readonly count: number;
  readonly stationIndex: Int32Array;
  /** Index into the input `species` array. */
  readonly speciesIndex: Uint16Array;
  readonly harmonic: Uint16Array;
  /** Index into the input `watchBands` array. */
  readonly watchBandIndex: Int32Array;
  readonly lineLowHz: Float64Array;
  readonly lineHighHz: Float64Array;
  /** Intersection width with the (unwidened) watch band, Hz. */
  readonly overlapHz: Float64Array;
  /** Total lines examined (stations × species × harmonics). */
  readonly linesExamined: number;
}

class HitBuffer {
  capacity: number;
  count = 0;
  station: Int32Array;
  species: Uint16Array;
  harmonic: Uint16Array;
  band: Int32Array;
  low: Float64Array;
  high: Float64Array;
  overlap: Float64Array;
  constructor(capacity: number) {
    this.capacity = capacity;
    this.station = new Int32Array(capacity);
    this.species = new Uint16Array(capacity);
    this.harmonic = new Uint16Array(capacity);
    this.band = new Int32Array(capacity);
    this.low = new Float64Array(capacity);
    this.high = new Float64Array(capacity);
    this.overlap = new Float64Array(capacity);
  }
  grow(): void {
    const capacity = this.capacity * 2;
    const grow = <T extends Int32Array | Uint16Array | Float64Array>(a: T, make: (n: number) => T): T => {
      const b = make(capacity);
      b.set(a);
      return b;
    };
    this.station = grow(this.station, (n) => new Int32Array(n));
    this.species = grow(this.species, (n) => new Uint16Array(n));
    this.harmonic = grow(this.harmonic, (n) => new Uint16Array(n));
    this.band = grow(this.band, (n) => new Int32Array(n));
    this.low = grow(this.low, (n) => new Float64Array(n));
    this.high = grow(this.high, (n) => new Float64Array(n));
    this.overlap = grow(this.overlap, (n) => new Float64Array(n));
    this.capacity = capacity;
  }
}

/**
 * Predicted lines of many stations against watch bands. For station i, species s, harmonic n, the line
 * spans [n·f_s·B_i(1−u_i), n·f_s·B_i(1+u_i)] with f_s = |q|/(2πγm) (Jackson §12.2); each band is widened
 * by `marginHz`. Closed-interval logic as in {@link bandOverlap}. Returns column arrays.
 */
export function findStationBandHits(input: StationBandHitsInput): StationBandHits {
  const { fieldsTesla, watchBands } = input;
  requireInteger(input.harmonicCount, 'harmonicCount', 1, MAX_HARMONIC);
  const marginHz = requireNonNegative(input.marginHz ?? 0, 'marginHz');
  requireArray(fieldsTesla, 'fieldsTesla', 'positive');
  const stationCount = fieldsTesla.length;
  const u = input.relativeUncertainty;
  if (typeof u === 'number') requireRelativeUncertainty(u);
  else {
    if (u.length !== stationCount) {
      throw new PhysicsInputError('LENGTH_MISMATCH', 'Give one relative uncertainty per station.', {
        field: 'relativeUncertainty',
        value: u.length,
      });
    }
    for (let i = 0; i < u.length; i++) requireRelativeUncertainty(u[i] as number, `relativeUncertainty[${i}]`);
  }
  if (input.species.length === 0 || input.species.length > 65_535) {
    throw new PhysicsInputError('INVALID_INPUT', 'Choose at least one species.', { field: 'species' });
  }
  const hzPerTesla = input.species.map((entry) => {
    const ref = typeof entry === 'object' && 'species' in entry ? entry.species : entry;
    const energy = typeof entry === 'object' && 'species' in entry ? (entry.kineticEnergyJ ?? 0) : 0;
    const { s, gamma } = resolveSpeciesAndEnergy(ref, energy);
    return (Math.abs(s.chargeNumber) * ELEMENTARY_CHARGE_C) / (2 * Math.PI * s.massKg * gamma);
  });

  // Watch bands sorted by widened low edge, with a running maximum of widened high edges.
  const bandCount = watchBands.length;
  watchBands.forEach((band, i) => requireBand(band, `watchBands[${i}]`));
  const order = Array.from({ length: bandCount }, (_, i) => i).sort(
    (a, b) => (watchBands[a] as WatchBand).lowHz - (watchBands[b] as WatchBand).lowHz,
  );
  const sortedLow = new Float64Array(bandCount);
  const sortedHigh = new Float64Array(bandCount);
  const bandLow = new Float64Array(bandCount);
  const bandHigh = new Float64Array(bandCount);
  const runningMaxHigh = new Float64Array(bandCount);
  const sortedIndex = new Int32Array(bandCount);
  let running = -Infinity;
  for (let k = 0; k < bandCount; k++) {
    const i = order[k] as number;
    const band = watchBands[i] as WatchBand;
    sortedIndex[k] = i;
    bandLow[k] = band.lowHz;
    bandHigh[k] = band.highHz;
    sortedLow[k] = band.lowHz - marginHz;
    sortedHigh[k] = band.highHz + marginHz;
    running = Math.max(running, sortedHigh[k] as number);
    runningMaxHigh[k] = running;
  }

  const hits = new HitBuffer(Math.max(1024, stationCount >> 2));
  const harmonicCount = input.harmonicCount;
  const speciesCount = hzPerTesla.length;
  const scalarU = typeof u === 'number' ? u : 0;
  // Quick rejects: no band below minLow or above maxHigh (widened), and lines rise with n.
  const minLow = bandCount > 0 ? (sortedLow[0] as number) : Infinity;
  const maxHigh = running;
  for (let i = 0; i < stationCount; i++) {
    const b = fieldsTesla[i] as number;
    const ui = typeof u === 'number' ? scalarU : (u[i] as number);
    const bLow = b * (1 - ui);
    const bHigh = b * (1 + ui);
    for (let s = 0; s < speciesCount; s++) {
      const k = hzPerTesla[s] as number;
      const f1Low = k * bLow;
      const f1High = k * bHigh;
      if (harmonicCount * f1High < minLow) continue;
      for (let n = 1; n <= harmonicCount; n++) {
        const lo = n * f1Low;
        if (lo > maxHigh) break;
        const hi = n * f1High;
        if (hi < minLow) continue;
        // Last sorted band whose widened low edge is ≤ hi.
        let a = 0;
        let z = bandCount;
        while (a < z) {
          const m = (a + z) >>> 1;
          if ((sortedLow[m] as number) <= hi) a = m + 1;
          else z = m;
        }
        for (let j = a - 1; j >= 0 && (runningMaxHigh[j] as number) >= lo; j--) {
          if ((sortedHigh[j] as number) >= lo) {
            if (hits.count === hits.capacity) hits.grow();
            const c = hits.count++;
            hits.station[c] = i;
            hits.species[c] = s;
            hits.harmonic[c] = n;
            hits.band[c] = sortedIndex[j] as number;
            hits.low[c] = lo;
            hits.high[c] = hi;
            hits.overlap[c] = Math.max(0, Math.min(hi, bandHigh[j] as number) - Math.max(lo, bandLow[j] as number));
          }
        }
      }
    }
  }
  const count = hits.count;
  return {
    count,
    stationIndex: hits.station.subarray(0, count),
    speciesIndex: hits.species.subarray(0, count),
    harmonic: hits.harmonic.subarray(0, count),
    watchBandIndex: hits.band.subarray(0, count),
    lineLowHz: hits.low.subarray(0, count),
    lineHighHz: hits.high.subarray(0, count),
    overlapHz: hits.overlap.subarray(0, count),
    linesExamined: stationCount * speciesCount * harmonicCount,
  };
}

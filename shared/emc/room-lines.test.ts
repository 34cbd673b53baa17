/**
 * Room predictions against hand computations from published constants (CODATA 2018, typed here
 * independently of shared/physics): e = 1.602 176 634e-19 C, mₑ = 9.109 383 7015e-31 kg,
 * mₚ = 1.672 621 923 69e-27 kg; f = eB/(2πm) (Jackson §12.2). Emission against the NRL Plasma Formulary's
 * cyclotron radiation law P = 6.21e-28 B² nₑ Tₑ W/cm³ (B in gauss, n in cm⁻³, T in eV), converted to SI.
 */
import { describe, expect, it } from 'vitest';
import { atVictim, bandHits, emissionAtVictim, expandedRelativeUncertainty, predictedBands, REFERENCE_ANALYSER, roomFieldInterval } from './room-lines';

const E = 1.602176634e-19;
const ME = 9.1093837015e-31;
const MP = 1.67262192369e-27;
const fe = (b: number) => (E * b) / (2 * Math.PI * ME);
const fp = (b: number) => (E * b) / (2 * Math.PI * MP);

describe('roomFieldInterval', () => {
  it('widens each reading by its expanded uncertainty (k = 2) and keeps the extremes', () => {
    // 0.1 T at u = 1 % → ±2 %; 0.2 T with no stated uncertainty → 2 % standard, ±4 % expanded.
    const interval = roomFieldInterval([
      { fieldT: 0.1, relativeStandardUncertainty: 0.01 },
      { fieldT: 0.2, relativeStandardUncertainty: null },
      { fieldT: 0.15, relativeStandardUncertainty: 0.005 },
    ])!;
    expect(interval.lowT).toBeCloseTo(0.098, 12);
    expect(interval.highT).toBeCloseTo(0.208, 12);
    expect(interval.maxReadT).toBe(0.2);
    expect(interval.readings).toBe(3);
  });

  it('is null without a usable reading, and skips zero or non-finite fields', () => {
    expect(roomFieldInterval([])).toBeNull();
    expect(roomFieldInterval([{ fieldT: 0, relativeStandardUncertainty: 0.01 }, { fieldT: Number.NaN, relativeStandardUncertainty: null }])).toBeNull();
    expect(roomFieldInterval([{ fieldT: 0, relativeStandardUncertainty: 0.01 }, { fieldT: 0.01, relativeStandardUncertainty: 0.01 }])!.readings).toBe(1);
  });

  it('never lets the widening reach zero field', () => {
    expect(expandedRelativeUncertainty(0.7)).toBe(0.99);
  });
});

describe('predictedBands', () => {
  it('electron and proton lines with harmonics over the interval', () => {
    const bands = predictedBands({ lowT: 0.0875 * 0.98, highT: 0.0875 * 1.02 }, ['electron', 'proton'], 2);
    expect(bands.map((b) => `${b.species}:${b.harmonic}`)).toEqual(['electron:1', 'electron:2', 'proton:1', 'proton:2']);
    // 87.5 mT: the ECR condition at 2.45 GHz (fₑ = 27.99 GHz/T × 0.0875 T ≈ 2.449 GHz).
    expect(bands[0]!.lowHz / fe(0.0875 * 0.98)).toBeCloseTo(1, 9);
    expect(bands[0]!.highHz / fe(0.0875 * 1.02)).toBeCloseTo(1, 9);
    expect(bands[1]!.lowHz / (2 * fe(0.0875 * 0.98))).toBeCloseTo(1, 9);
    expect(bands[3]!.highHz / (2 * fp(0.0875 * 1.02))).toBeCloseTo(1, 9);
    expect(fe(0.0875) / 1e9).toBeCloseTo(2.4493, 4);
  });
});

describe('bandHits', () => {
  const line = { species: 'electron' as const, harmonic: 1, lowHz: 100, highHz: 200 };
  const band = (id: string, lowerHz: number, upperHz: number) => ({ id, lowerHz, upperHz });
  it('inside, spanning, partly over, touching at an edge, and apart', () => {
    const hits = bandHits([line], [band('inside', 120, 150), band('spanning', 50, 300), band('over', 180, 250), band('touching', 200, 260), band('apart', 201, 260), band('below', 10, 99.999)]);
    expect(hits.map((h) => [h.band.id, h.overlapLowHz, h.overlapHighHz])).toEqual([
      ['inside', 120, 150],
      ['spanning', 100, 200],
      ['over', 180, 200],
      ['touching', 200, 200],
    ]);
  });
});

describe('emissionAtVictim', () => {
  const emitter = { name: 'ECR source', electronDensityPerM3: 1e16, electronEnergyEv: 5, energyKind: 'perpendicular' as const, volumeM3: 1e-3 };
  const fundamental = { species: 'electron' as const, harmonic: 1, lowHz: 2.40e9, highHz: 2.50e9 };

  it('matches the NRL law and the inverse-square law', () => {
    // NRL: 6.21e-28 × (875 G)² × (1e10 cm⁻³) × 5 eV W/cm³ = 2.3775e-11 W/cm³ = 2.3775e-5 W/m³; × 1 L.
    const nrlWPerM3 = 6.21e-28 * 875 ** 2 * 1e10 * 5 * 1e6;
    const out = emissionAtVictim({ line: fundamental, emitters: [emitter], fieldT: 0.0875, victimDistanceM: 10, thresholdDbWPerM2Hz: -239 })!;
    expect(out.emittedPowerW / (nrlWPerM3 * 1e-3)).toBeCloseTo(1, 2);
    expect(out.fluxDensityWPerM2).toBeCloseTo(out.emittedPowerW / (4 * Math.PI * 100), 20);
    expect(out.spectralFluxDensityDbWPerM2Hz).toBeCloseTo(10 * Math.log10(out.fluxDensityWPerM2 / 1e8), 9);
    expect(out.marginDb).toBeCloseTo(out.spectralFluxDensityDbWPerM2Hz + 239, 9);
  });

  it('a total (isotropic) energy counts two thirds perpendicular; emitters add', () => {
    const perp = emissionAtVictim({ line: fundamental, emitters: [emitter], fieldT: 0.1, victimDistanceM: 5, thresholdDbWPerM2Hz: null })!;
    const total = emissionAtVictim({ line: fundamental, emitters: [{ ...emitter, energyKind: 'total', electronEnergyEv: 7.5 }], fieldT: 0.1, victimDistanceM: 5, thresholdDbWPerM2Hz: null })!;
    expect(total.emittedPowerW / perp.emittedPowerW).toBeCloseTo(1, 12);
    const two = emissionAtVictim({ line: fundamental, emitters: [emitter, emitter], fieldT: 0.1, victimDistanceM: 5, thresholdDbWPerM2Hz: null })!;
    expect(two.emittedPowerW / perp.emittedPowerW).toBeCloseTo(2, 12);
    expect(perp.marginDb).toBeNull();
  });

  it('is not estimated for harmonics, ions, or a room without emitters', () => {
    expect(emissionAtVictim({ line: { ...fundamental, harmonic: 2 }, emitters: [emitter], fieldT: 0.1, victimDistanceM: 5, thresholdDbWPerM2Hz: null })).toBeNull();
    expect(emissionAtVictim({ line: { ...fundamental, species: 'proton' }, emitters: [emitter], fieldT: 0.1, victimDistanceM: 5, thresholdDbWPerM2Hz: null })).toBeNull();
    expect(emissionAtVictim({ line: fundamental, emitters: [], fieldT: 0.1, victimDistanceM: 5, thresholdDbWPerM2Hz: null })).toBeNull();
  });
});

describe('atVictim', () => {
  it('received power on the reference analyser against its noise floor, worked by hand', () => {
    // 1 µW isotropic at 10 m: S = 1e-6 / (4π·100) W/m². A 0 dBi antenna at the line's centre
    // f = √(2.4e9·2.5e9) Hz has Aₑ = λ²/(4π), λ = c/f with c = 299 792 458 m/s (SI, exact) (Balanis,
    // "Effective aperture"); a 100 kHz RBW takes 1e5/1e8 of a line 100 MHz wide. Noise floor
    // −150 dBm/Hz + 10·log₁₀(1e5) = −100 dBm.
    const S = 1e-6 / (4 * Math.PI * 100);
    const lambda = 299792458 / Math.sqrt(2.4e9 * 2.5e9);
    const receivedW = S * ((lambda * lambda) / (4 * Math.PI)) * (1e5 / 1e8);
    const out = atVictim(1e-6, 0.0875, { lowHz: 2.4e9, highHz: 2.5e9 }, 10, null);
    expect(REFERENCE_ANALYSER).toEqual({ danlDbmPerHz: -150, rbwHz: 100e3, antennaGainDbi: 0 });
    expect(out.receivedInRbwDbm).toBeCloseTo(10 * Math.log10(receivedW / 1e-3), 9);
    expect(out.receivedInRbwDbm).toBeCloseTo(-120.23, 2);
    expect(out.analyserNoiseFloorDbm).toBeCloseTo(-100, 12);
    expect(out.noiseMarginDb).toBeCloseTo(out.receivedInRbwDbm + 100, 12);
    expect(out.marginDb).toBeNull();
  });

  it('a line narrower than the RBW falls wholly inside it', () => {
    const narrow = atVictim(1e-6, 0.1, { lowHz: 2.45e9, highHz: 2.45e9 + 1e3 }, 10, null);
    const S = 1e-6 / (4 * Math.PI * 100);
    const f = Math.sqrt(2.45e9 * (2.45e9 + 1e3));
    const lambda = 299792458 / f;
    expect(narrow.receivedInRbwDbm).toBeCloseTo(10 * Math.log10((S * lambda * lambda) / (4 * Math.PI) / 1e-3), 9);
  });
});

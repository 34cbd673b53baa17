import { describe, expect, it } from 'vitest';
import {
  combinePeaks,
  downsampleMinMax,
  explainPeaks,
  findTracePeaks,
  formatHzRange,
  MAD_TO_SIGMA,
  peakToleranceHz,
  PeakInputError,
  predictLines,
  type PredictedLine,
} from './peaks';
import { synthesiseTrace } from './synthetic-trace';
import { parseTraceCsv, traceToCsv } from './trace-csv';

// CODATA 2018 (NIST listing): e/(2π mₑ) = 27.992 489 872 GHz/T; e/(2π mₚ) from e = 1.602176634e-19 C
// (exact) and mₚ = 1.67262192369e-27 kg: 15.245 093 MHz/T (computed by hand from those two values).
const ELECTRON_HZ_PER_T = 27.992_489_872e9;
const PROTON_HZ_PER_T = 1.602176634e-19 / (2 * Math.PI * 1.67262192369e-27);

/** A line band of an exactly known field interval, widened by u, as the closed form n·k·B·(1 ± u). */
function band(species: string, harmonic: number, hzPerT: number, bMinT: number, bMaxT: number, u: number): PredictedLine {
  return { species, harmonic, lowHz: harmonic * hzPerT * bMinT * (1 - u), highHz: harmonic * hzPerT * bMaxT * (1 + u) };
}

describe('predicted lines', () => {
  it('equal n·e·B/(2πm)·(1 ± u) for the electron and the proton (CODATA 2018)', () => {
    const lines = predictLines({ species: ['electron', 'proton'], maxHarmonic: 3, fieldMinTesla: 0.085, fieldMaxTesla: 0.0875, relativeUncertainty: 0.01 });
    expect(lines).toHaveLength(6);
    for (const expected of [band('electron', 1, ELECTRON_HZ_PER_T, 0.085, 0.0875, 0.01), band('electron', 3, ELECTRON_HZ_PER_T, 0.085, 0.0875, 0.01), band('proton', 2, PROTON_HZ_PER_T, 0.085, 0.0875, 0.01)]) {
      const got = lines.find((l) => l.species === expected.species && l.harmonic === expected.harmonic)!;
      expect(got.lowHz / expected.lowHz).toBeCloseTo(1, 8);
      expect(got.highHz / expected.highHz).toBeCloseTo(1, 8);
    }
  });
});

describe('finding peaks in a trace', () => {
  // 2.3–2.6 GHz, 3001 points (100 kHz bins), RBW 100 kHz, floor −90 dBm with 1 dB noise.
  const rbwHz = 100e3;
  const electronLineHz = ELECTRON_HZ_PER_T * 0.0875; // 2.449 GHz, ECR resonance field
  const spuriousHz = 2.5173e9;
  const trace = synthesiseTrace({
    startHz: 2.3e9,
    stopHz: 2.6e9,
    points: 3001,
    rbwHz,
    noiseFloorDbm: -90,
    noiseSigmaDb: 1,
    signals: [
      { frequencyHz: electronLineHz, levelDbm: -60 },
      { frequencyHz: spuriousHz, levelDbm: -70 },
    ],
    seed: 20_261_201,
  });

  it('puts the floor at the median level and finds exactly the two signals, within a bin', () => {
    const result = findTracePeaks(trace, { rbwHz });
    expect(result.noiseFloorDbm).toBeGreaterThan(-91);
    expect(result.noiseFloorDbm).toBeLessThan(-89);
    // The MAD of normal noise with σ = 1 dB estimates σ (1.4826·MAD), so the noise threshold is near 6 dB and 10 dB rules.
    expect(result.noiseSigmaDb).toBeGreaterThan(0.8);
    expect(result.noiseSigmaDb).toBeLessThan(1.2);
    expect(result.thresholdDbm).toBeCloseTo(result.noiseFloorDbm + 10, 6);
    expect(result.peaks.map((p) => p.frequencyHz)).toHaveLength(2);
    expect(Math.abs(result.peaks[0]!.frequencyHz - electronLineHz)).toBeLessThanOrEqual(50e3 + 1);
    expect(Math.abs(result.peaks[1]!.frequencyHz - spuriousHz)).toBeLessThanOrEqual(50e3 + 1);
    // Between bins the maximum is at most half a bin (0.5 RBW) off: −12.04·0.5² = −3.01 dB (Gaussian filter).
    expect(result.peaks[0]!.levelDbm).toBeGreaterThan(-60 - 3.02 - 0.1);
    expect(result.peaks[0]!.levelDbm).toBeLessThan(-59.9);
    expect(result.peaks[0]!.binWidthHz).toBeCloseTo(100e3, 0);
  });

  it('explains the electron line and leaves the spurious peak unexplained', () => {
    const { peaks } = findTracePeaks(trace, { rbwHz });
    const lines = predictLines({ species: ['electron', 'proton'], maxHarmonic: 3, fieldMinTesla: 0.087, fieldMaxTesla: 0.088, relativeUncertainty: 0.01 });
    const explained = explainPeaks({ peaks: combinePeaks([], peaks, rbwHz), lines, rbwHz, analyserRelativeAccuracy: 1e-6 });
    expect(explained.map((p) => p.status)).toEqual(['explained', 'unexplained']);
    expect(explained[0]!.explainedBy).toMatchObject({ species: 'electron', harmonic: 1 });
    expect(explained[0]!.label).toMatch(/^explained by the electron line n = 1 at 2\.4\d–2\.4\d GHz$/);
    expect(explained[1]!.label).toBe('unexplained');
  });

  it('finds nothing in noise alone, even with noise of 3 dB (the 6σ threshold rises)', () => {
    const noise = synthesiseTrace({ startHz: 1e6, stopHz: 30e6, points: 5801, rbwHz: 9e3, noiseFloorDbm: -100, noiseSigmaDb: 3, signals: [], seed: 7 });
    const result = findTracePeaks(noise, { rbwHz: 9e3 });
    expect(result.peaks).toEqual([]);
    expect(result.thresholdDbm - result.noiseFloorDbm).toBeGreaterThan(15);
  });

  it('merges two signals closer than the RBW into one peak and keeps two signals 5 RBW apart', () => {
    const close = synthesiseTrace({ startHz: 2.4e9, stopHz: 2.5e9, points: 2001, rbwHz, noiseFloorDbm: -90, noiseSigmaDb: 0.5, signals: [{ frequencyHz: 2.45e9, levelDbm: -50 }, { frequencyHz: 2.45e9 + 0.6 * rbwHz, levelDbm: -52 }], seed: 3 });
    expect(findTracePeaks(close, { rbwHz }).peaks).toHaveLength(1);
    const apart = synthesiseTrace({ startHz: 2.4e9, stopHz: 2.5e9, points: 2001, rbwHz, noiseFloorDbm: -90, noiseSigmaDb: 0.5, signals: [{ frequencyHz: 2.45e9, levelDbm: -50 }, { frequencyHz: 2.45e9 + 5 * rbwHz, levelDbm: -52 }], seed: 3 });
    expect(findTracePeaks(apart, { rbwHz }).peaks).toHaveLength(2);
  });

  it('needs the prominence: a shoulder on a big peak is not a second peak', () => {
    // Hand-made trace: floor −90, a peak of −40 with a bump of 2 dB on its flank (prominence 2 dB < 6 dB).
    const pad = Array<number>(40).fill(-90);
    const levels = [...pad, -70, -60, -58, -60, -50, -40, -50, -70, ...pad];
    const t = { frequencyHz: Float64Array.from(levels, (_, i) => 1e6 + i * 1e3), levelDbm: Float64Array.from(levels) };
    const { peaks } = findTracePeaks(t, { rbwHz: 1e3 });
    expect(peaks.map((p) => p.levelDbm)).toEqual([-40]);
    expect(peaks[0]!.prominenceDb).toBe(50);
  });

  it('computes the noise σ as 1.4826·MAD (Rousseeuw & Croux 1993)', () => {
    // Levels −90 ± 1 alternating: median −90 (even count: mean of the two middle values), MAD 1.
    const levels = Array.from({ length: 10 }, (_, i) => (i % 2 === 0 ? -89 : -91));
    const t = { frequencyHz: Float64Array.from(levels, (_, i) => 1e6 + i * 1e3), levelDbm: Float64Array.from(levels) };
    const result = findTracePeaks(t, { rbwHz: 1e3 });
    expect(result.noiseFloorDbm).toBe(-90);
    expect(result.noiseSigmaDb).toBeCloseTo(MAD_TO_SIGMA, 12);
    expect(result.peaks).toEqual([]);
  });

  it('refuses traces whose frequencies do not rise, or whose arrays differ in length', () => {
    expect(() => findTracePeaks({ frequencyHz: Float64Array.from([2, 1, 3]), levelDbm: Float64Array.from([0, 0, 0]) }, { rbwHz: 1 })).toThrow(PeakInputError);
    expect(() => findTracePeaks({ frequencyHz: Float64Array.from([1, 2]), levelDbm: Float64Array.from([0]) }, { rbwHz: 1 })).toThrow(PeakInputError);
    expect(() => findTracePeaks({ frequencyHz: Float64Array.from([1, 2]), levelDbm: Float64Array.from([0, 0]) }, { rbwHz: 0 })).toThrow(PeakInputError);
  });
});

describe('explaining peaks', () => {
  it('accepts a peak exactly at the tolerance edge and refuses one just beyond it', () => {
    // Band edge 2.47 GHz, RBW 100 kHz, accuracy 0: tolerance RBW/2 = 50 kHz exactly.
    const lines: PredictedLine[] = [{ species: 'electron', harmonic: 2, lowHz: 2.41e9, highHz: 2.47e9 }];
    const result = explainPeaks({
      peaks: [
        { frequencyHz: 2.47005e9, levelDbm: -60, source: 'marker' },
        { frequencyHz: 2.470051e9, levelDbm: -60, source: 'marker' },
        { frequencyHz: 2.40995e9, levelDbm: -60, source: 'marker' },
      ],
      lines,
      rbwHz: 100e3,
      analyserRelativeAccuracy: 0,
    });
    expect(result.map((p) => p.status)).toEqual(['explained', 'unexplained', 'explained']);
    expect(result[0]!.label).toBe('explained by the electron line n = 2 at 2.41–2.47 GHz');
    expect(result[0]!.explainedBy!.distanceHz).toBeCloseTo(50e3, 3);
  });

  it('adds the analyser accuracy and half a bin for trace peaks to the tolerance', () => {
    expect(peakToleranceHz(2e9, 100e3, 1e-6)).toBeCloseTo(50e3 + 2e3, 6);
    expect(peakToleranceHz(2e9, 100e3, 1e-6, 40e3)).toBeCloseTo(50e3 + 20e3 + 2e3, 6);
    const lines: PredictedLine[] = [{ species: 'electron', harmonic: 1, lowHz: 1e9, highHz: 2e9 }];
    // 2 GHz + 52 kHz − 1 Hz: inside only because of the 1 ppm accuracy (2 kHz).
    const [marker] = explainPeaks({ peaks: [{ frequencyHz: 2e9 + 51_999, levelDbm: -1, source: 'marker' }], lines, rbwHz: 100e3, analyserRelativeAccuracy: 1e-6 });
    expect(marker!.status).toBe('explained');
    const [bare] = explainPeaks({ peaks: [{ frequencyHz: 2e9 + 51_999, levelDbm: -1, source: 'marker' }], lines, rbwHz: 100e3, analyserRelativeAccuracy: 0 });
    expect(bare!.status).toBe('unexplained');
    const [trace] = explainPeaks({ peaks: [{ frequencyHz: 2e9 + 60e3, levelDbm: -1, source: 'trace', binWidthHz: 40e3 }], lines, rbwHz: 100e3, analyserRelativeAccuracy: 0 });
    expect(trace!.status).toBe('explained');
  });

  it('picks the nearest of two lines close together and lists the other', () => {
    // Electron n = 2 at B and n = 3 at 2B/3 coincide: 2·k·B = 3·k·(2B/3). Shift one slightly.
    const a = band('electron', 2, ELECTRON_HZ_PER_T, 0.044, 0.044, 0.001);
    const b = band('electron', 3, ELECTRON_HZ_PER_T, 0.0294, 0.0294, 0.001);
    const lineA = 2 * ELECTRON_HZ_PER_T * 0.044; // 2.46333 GHz
    const lineB = 3 * ELECTRON_HZ_PER_T * 0.0294; // 2.46893 GHz
    const [nearA, nearB, between] = explainPeaks({
      peaks: [
        { frequencyHz: lineA, levelDbm: -70, source: 'marker' },
        { frequencyHz: lineB, levelDbm: -70, source: 'marker' },
        { frequencyHz: (a.highHz + b.lowHz) / 2, levelDbm: -70, source: 'marker' },
      ],
      lines: [b, a],
      rbwHz: 3e6,
      analyserRelativeAccuracy: 0,
    });
    expect(nearA!.explainedBy).toMatchObject({ harmonic: 2, distanceHz: 0 });
    expect(nearB!.explainedBy).toMatchObject({ harmonic: 3, distanceHz: 0 });
    // Between the two bands (gap < RBW): both are within tolerance; the nearer one, or the lower harmonic on a tie.
    expect(between!.status).toBe('explained');
    expect(between!.alsoWithin).toHaveLength(1);
    expect(between!.explainedBy!.harmonic).toBe(2);
  });

  it('explains the second and third harmonics and the proton line, and nothing else', () => {
    const lines = predictLines({ species: ['electron', 'proton'], maxHarmonic: 3, fieldMinTesla: 1.5, fieldMaxTesla: 1.5, relativeUncertainty: 0.005 });
    const bFringeT = 0.03;
    const fringe = predictLines({ species: ['electron'], maxHarmonic: 3, fieldMinTesla: bFringeT, fieldMaxTesla: bFringeT, relativeUncertainty: 0.005 });
    const result = explainPeaks({
      peaks: [
        { frequencyHz: PROTON_HZ_PER_T * 1.5, levelDbm: -90, source: 'marker' }, // 22.868 MHz
        { frequencyHz: 2 * ELECTRON_HZ_PER_T * bFringeT, levelDbm: -80, source: 'marker' }, // 1.679 GHz
        { frequencyHz: 3 * ELECTRON_HZ_PER_T * bFringeT, levelDbm: -85, source: 'marker' }, // 2.519 GHz
        { frequencyHz: 42.577478518e6 * 1.5, levelDbm: -85, source: 'marker' }, // proton NMR precession, not a cyclotron line (CODATA 2018)
      ],
      lines: [...lines, ...fringe],
      rbwHz: 9e3,
    });
    expect(result[0]!.explainedBy).toMatchObject({ species: 'proton', harmonic: 1 });
    expect(result[1]!.explainedBy).toMatchObject({ species: 'electron', harmonic: 2 });
    expect(result[2]!.explainedBy).toMatchObject({ species: 'electron', harmonic: 3 });
    expect(result[3]!.status).toBe('unexplained');
  });

  it('drops a trace peak that duplicates a marker', () => {
    const combined = combinePeaks(
      [{ frequencyHz: 2.45e9, levelDbm: -30 }],
      [
        { frequencyHz: 2.45e9 + 40e3, levelDbm: -31, prominenceDb: 50, binWidthHz: 100e3, index: 1 },
        { frequencyHz: 2.5e9, levelDbm: -70, prominenceDb: 20, binWidthHz: 100e3, index: 2 },
      ],
      100e3,
    );
    expect(combined.map((p) => p.source)).toEqual(['marker', 'trace']);
  });

  it('formats ranges with enough digits to tell the edges apart', () => {
    expect(formatHzRange(2.41e9, 2.47e9)).toBe('2.41–2.47 GHz');
    expect(formatHzRange(2.4491e9, 2.4493e9)).toBe('2.4491–2.4493 GHz');
    expect(formatHzRange(22.8e6, 22.9e6)).toBe('22.8–22.9 MHz');
  });
});

describe('trace files and display thinning', () => {
  it('round-trips a trace through the CSV format the capture form accepts', () => {
    const t = synthesiseTrace({ startHz: 1e6, stopHz: 30e6, points: 101, rbwHz: 9e3, noiseFloorDbm: -100, noiseSigmaDb: 1, signals: [], seed: 1 });
    const parsed = parseTraceCsv(traceToCsv(t));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.unit).toBe('MHz');
    expect(parsed.trace.frequencyHz.length).toBe(101);
    expect(parsed.trace.frequencyHz[100]).toBeCloseTo(30e6, 3);
    expect(parsed.trace.levelDbm[3]).toBeCloseTo(t.levelDbm[3]!, 2);
  });

  it('reads headerless Hz rows with semicolons, and says which row is wrong', () => {
    const ok = parseTraceCsv('2000;-50\n1000;-60\n');
    expect(ok.ok && Array.from(ok.trace.frequencyHz)).toEqual([1000, 2000]);
    expect(parseTraceCsv('Frequency (GHz),Level\n1,x\n')).toEqual({ ok: false, message: 'Row 2: “x” is not a level in dBm.' });
    expect(parseTraceCsv('')).toEqual({ ok: false, message: 'The trace file is empty.' });
  });

  it('thins to at most 2,000 points and keeps the highest point', () => {
    const t = synthesiseTrace({ startHz: 1e6, stopHz: 30e6, points: 10_001, rbwHz: 9e3, noiseFloorDbm: -100, noiseSigmaDb: 1, signals: [{ frequencyHz: 7.05e6, levelDbm: -60 }], seed: 2 });
    const thin = downsampleMinMax(t, 2000);
    expect(thin.frequencyHz.length).toBeLessThanOrEqual(2000);
    expect(Math.max(...thin.levelDbm)).toBe(Math.max(...t.levelDbm));
    expect(Math.min(...thin.levelDbm)).toBe(Math.min(...t.levelDbm));
    for (let i = 1; i < thin.frequencyHz.length; i++) expect(thin.frequencyHz[i]!).toBeGreaterThan(thin.frequencyHz[i - 1]!);
  });
});

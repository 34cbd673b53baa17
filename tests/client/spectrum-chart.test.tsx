/**
 * The spectrum chart's pure parts (src/features/emc/components/spectrum-chart.tsx): the axis chosen from
 * the span, the datasets and annotations built from a sweep explained, and the text beside the canvas.
 * Frequencies are checked against CODATA 2018 (e/(2π mₑ) = 27.992 489 872 GHz/T) and the ISM band
 * 2400–2500 MHz of the ITU Radio Regulations (RR 5.150).
 */
import { cleanup, fireEvent, render, screen, within } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { ExplainedPeakWire, PredictedLineWire, SweepWatchBand } from '@shared/schemas/emc-sweep';
import {
  buildAnnotations,
  buildSpectrumData,
  chooseFrequencyAxis,
  FrequencyAxisToggle,
  frequencyTicks,
  lineLabel,
  peakTableRows,
  peakTag,
  SpectrumPeakTable,
  spectrumSummary,
  themeColours,
  withAlpha,
} from '@/features/emc/components/spectrum-chart';

afterEach(cleanup);

const ELECTRON_HZ_PER_T = 27.992_489_872e9;
const B_T = 0.0885;
const line1: PredictedLineWire = { species: 'electron', harmonic: 1, lowHz: ELECTRON_HZ_PER_T * B_T * 0.98, highHz: ELECTRON_HZ_PER_T * B_T * 1.02 };
const line2: PredictedLineWire = { species: 'electron', harmonic: 2, lowHz: 2 * line1.lowHz, highHz: 2 * line1.highHz };
const proton: PredictedLineWire = { species: 'proton', harmonic: 1, lowHz: 1.3e6, highHz: 1.4e6 };
const ism: SweepWatchBand = { id: '00000000-0000-7000-8000-00000000b001', name: 'ISM 2.4 GHz', lowerHz: 2.4e9, upperHz: 2.5e9, severity: 'medium', siteId: null };
const far: SweepWatchBand = { id: '00000000-0000-7000-8000-00000000b002', name: 'GNSS L1', lowerHz: 1575.42e6 - 1.023e6, upperHz: 1575.42e6 + 1.023e6, severity: 'high', siteId: null };
const explainedPeak: ExplainedPeakWire = {
  frequencyHz: ELECTRON_HZ_PER_T * B_T,
  levelDbm: -61.3,
  source: 'marker',
  toleranceHz: 50e3,
  status: 'explained',
  explainedBy: { ...line1, distanceHz: 0 },
  alsoWithin: [],
  label: 'explained by the electron line n = 1 at 2.43–2.53 GHz',
};
const strayPeak: ExplainedPeakWire = { frequencyHz: 2.3512e9, levelDbm: -80, source: 'trace', toleranceHz: 100e3, status: 'unexplained', explainedBy: null, alsoWithin: [], label: 'unexplained' };
const trace = { frequencyHz: [2.3e9, 2.4e9, 2.5e9, 2.6e9], levelDbm: [-110, -109, -61, -110] };

describe('the frequency axis', () => {
  it('is logarithmic for a span of a decade or more and linear below, and never logarithmic from 0 Hz', () => {
    expect(chooseFrequencyAxis(1e6, 30e6)).toBe('logarithmic');
    expect(chooseFrequencyAxis(1e6, 10e6)).toBe('logarithmic');
    expect(chooseFrequencyAxis(2.3e9, 2.6e9)).toBe('linear');
    expect(chooseFrequencyAxis(0, 30e6)).toBe('linear');
  });

  it('puts ticks at 1-2-5 steps: 50 MHz steps over 2.3–2.6 GHz, 1-2-5 × 10ᵏ over a decade on a log axis', () => {
    expect(frequencyTicks(2.3e9, 2.6e9, 'linear')).toEqual([2.3e9, 2.35e9, 2.4e9, 2.45e9, 2.5e9, 2.55e9, 2.6e9]);
    expect(frequencyTicks(2.3e9, 2.6e9, 'logarithmic')).toEqual([2.3e9, 2.35e9, 2.4e9, 2.45e9, 2.5e9, 2.55e9, 2.6e9]);
    expect(frequencyTicks(1e6, 30e6, 'logarithmic')).toEqual([1e6, 2e6, 5e6, 10e6, 20e6]);
    expect(frequencyTicks(9e3, 6e9, 'logarithmic')).toEqual([1e4, 1e5, 1e6, 1e7, 1e8, 1e9]);
    expect(frequencyTicks(0, 30e6, 'linear')).toEqual([0, 5e6, 10e6, 15e6, 20e6, 25e6, 30e6]);
  });
});

describe('datasets and annotations', () => {
  const colours = themeColours();

  it('draws the trace as a line and puts explained and unexplained peaks in sets of different shapes', () => {
    const data = buildSpectrumData({ trace, peaks: [explainedPeak, strayPeak], axis: 'linear', colours });
    const [line, explained, unexplained] = data.datasets;
    expect(line!.data).toHaveLength(4);
    expect(line).toMatchObject({ showLine: true, pointRadius: 0 });
    expect(explained!.data).toEqual([{ x: explainedPeak.frequencyHz, y: -61.3, label: '✓ e⁻ n=1 (marker)' }]);
    expect(unexplained!.data).toEqual([{ x: 2.3512e9, y: -80, label: '? unexplained (trace)' }]);
    expect(explained!.pointStyle).not.toBe(unexplained!.pointStyle);
  });

  it('drops points at 0 Hz on a log axis only', () => {
    const withZero = { frequencyHz: [0, 1e6, 2e6], levelDbm: [-90, -91, -92] };
    expect(buildSpectrumData({ trace: withZero, peaks: [], axis: 'logarithmic', colours }).datasets[0]!.data).toHaveLength(2);
    expect(buildSpectrumData({ trace: withZero, peaks: [], axis: 'linear', colours }).datasets[0]!.data).toHaveLength(3);
    expect(buildSpectrumData({ trace: null, peaks: [explainedPeak], axis: 'linear', colours }).datasets[0]!.data).toEqual([]);
  });

  it('labels lines "e⁻ n=1", shades watch bands in the span, clips them to it and leaves out what lies outside', () => {
    const annotations = buildAnnotations({ lines: [line1, line2, proton], watchBands: [ism, far], peaks: [explainedPeak, strayPeak], startHz: 2.3e9, stopHz: 2.6e9, colours });
    const keys = Object.keys(annotations).sort();
    // n = 2 (≈ 4.95 GHz), the proton line (1.3 MHz) and GNSS L1 (1575.42 MHz) lie outside 2.3–2.6 GHz.
    expect(keys).toEqual(['band-0', 'line-0', 'peak-0', 'peak-1']);
    expect(annotations['line-0']).toMatchObject({ type: 'box', xMin: line1.lowHz, xMax: line1.highHz, label: { content: 'e⁻ n=1' } });
    expect(annotations['band-0']).toMatchObject({ type: 'box', xMin: 2.4e9, xMax: 2.5e9, label: { content: 'ISM 2.4 GHz' } });
    const clipped = buildAnnotations({ lines: [line1], watchBands: [], peaks: [], startHz: 2.45e9, stopHz: 2.6e9, colours });
    expect(clipped['line-0']).toMatchObject({ xMin: 2.45e9, xMax: line1.highHz });
    expect(annotations['peak-1']).toMatchObject({ type: 'label', content: '? unexplained' });
  });

  it('names lines by species symbol and harmonic', () => {
    expect(lineLabel({ species: 'proton', harmonic: 3 })).toBe('p⁺ n=3');
    expect(peakTag(explainedPeak)).toBe('✓ e⁻ n=1');
    expect(peakTag(strayPeak)).toBe('? unexplained');
  });
});

describe('colours', () => {
  it('turns a theme hex colour into rgba with the alpha asked for (CSS Color 4 hex notation)', () => {
    expect(withAlpha('#0f766e', 0.18)).toBe('rgba(15, 118, 110, 0.18)');
    expect(withAlpha('#fff', 0.5)).toBe('rgba(255, 255, 255, 0.5)');
    expect(withAlpha('rebeccapurple', 0.5)).toBe('rebeccapurple');
  });
});

describe('the text beside the chart', () => {
  it('lists peaks in frequency order with their finding and tolerance', () => {
    const rows = peakTableRows([explainedPeak, strayPeak]);
    expect(rows.map((r) => r.status)).toEqual(['Unexplained', 'Explained']);
    expect(rows[1]!.detail).toContain('explained by the electron line n = 1');
    expect(rows[1]!.shape).toBe('triangle');
    expect(rows[0]!.source).toBe('Trace');
  });

  it('sums up the span, the counts, the lines and the watch bands in one sentence', () => {
    const text = spectrumSummary({ peaks: [explainedPeak, strayPeak], lines: [line1, line2], watchBands: [ism], startHz: 2.3e9, stopHz: 2.6e9, hasTrace: true });
    expect(text).toContain('2 peaks: 1 explained, 1 unexplained.');
    expect(text).toContain('e⁻ n=1');
    expect(text).not.toContain('e⁻ n=2');
    expect(text).toContain('Watch bands in view: ISM 2.4 GHz.');
  });
});

// chart.js cannot draw in happy-dom (no 2D canvas context), so the chart itself is seen in the browser
// tests; here the parts around it that carry the same content as text.
describe('the table and the axis toggle', () => {
  it('lists every peak with its shape, source and finding, and says so when there is none', () => {
    render(<SpectrumPeakTable peaks={[explainedPeak, strayPeak]} />);
    const table = screen.getByRole('table');
    expect(within(table).getAllByRole('row')).toHaveLength(3);
    expect(within(table).getByText(/explained by the electron line n = 1/)).toBeTruthy();
    expect(within(table).getByText('Unexplained')).toBeTruthy();
    cleanup();
    render(<SpectrumPeakTable peaks={[]} />);
    expect(screen.getByText(/No peaks/)).toBeTruthy();
  });

  it('switches the axis, and refuses the log axis for a span from 0 Hz', () => {
    const chosen: string[] = [];
    render(<FrequencyAxisToggle axis="linear" logAllowed onChange={(a) => chosen.push(a)} />);
    expect(screen.getByRole('button', { name: 'Linear axis' }).getAttribute('aria-pressed')).toBe('true');
    fireEvent.click(screen.getByRole('button', { name: 'Log axis' }));
    expect(chosen).toEqual(['logarithmic']);
    cleanup();
    render(<FrequencyAxisToggle axis="linear" logAllowed={false} onChange={(a) => chosen.push(a)} />);
    expect(screen.getByRole('button', { name: 'Log axis' }).hasAttribute('disabled')).toBe(true);
  });
});

/**
 * A sweep's spectrum (issue 8 §5): the trace (level in dBm against frequency) drawn with chart.js, the
 * predicted cyclotron lines as labelled bands ("e⁻ n=1"), the watch bands as shaded spans and every peak
 * marked — explained peaks as upright triangles, unexplained ones as crosses, each with a short label,
 * so the difference never rests on colour alone. The frequency axis is linear or logarithmic (the span
 * decides the default: more than a decade reads better on a log axis; a toggle overrides it).
 *
 * The canvas is a picture; the same content is given as text beside it: a summary and a table of peaks
 * for screen readers and for anyone reading numbers off the plot.
 *
 * The pure parts (axis choice, datasets, annotations, table rows) are exported for tests.
 */
import { useMemo, useState } from 'react';
import {
  Chart as ChartJS,
  Legend,
  LinearScale,
  LineController,
  LineElement,
  LogarithmicScale,
  PointElement,
  ScatterController,
  Tooltip,
  type ChartData,
  type ChartOptions,
} from 'chart.js';
import annotationPlugin, { type AnnotationOptions } from 'chartjs-plugin-annotation';
import { Chart } from 'react-chartjs-2';
import type { ExplainedPeakWire, PredictedLineWire, SweepWatchBand } from '@shared/schemas/emc-sweep';
import { formatFrequency } from '@shared/units';
import { useTheme } from '@/lib/theme';

ChartJS.register(LineController, ScatterController, LineElement, PointElement, LinearScale, LogarithmicScale, Tooltip, Legend, annotationPlugin);

export type FrequencyAxis = 'linear' | 'logarithmic';

export interface SpectrumTrace {
  frequencyHz: readonly number[];
  levelDbm: readonly number[];
}

export interface SpectrumChartProps {
  /** The trace thinned for display, or null when the sweep has none (markers are still drawn). */
  trace: SpectrumTrace | null;
  peaks: readonly ExplainedPeakWire[];
  lines: readonly PredictedLineWire[];
  watchBands: readonly SweepWatchBand[];
  /** The sweep's span, Hz: the axis covers it even without a trace. */
  startHz: number;
  stopHz: number;
  /** Why no trace is drawn, shown in its place. */
  traceNote?: string | null;
  /** Starting axis; by default chosen from the span. */
  initialAxis?: FrequencyAxis;
}

/** Short symbols for line labels ("e⁻ n=1"). */
export const SPECIES_SYMBOLS: Record<string, string> = {
  electron: 'e⁻',
  proton: 'p⁺',
  deuteron: 'd⁺',
  alpha: 'α',
  helion: 'h',
  'h-minus': 'H⁻',
  'h2-plus': 'H₂⁺',
};

export const lineLabel = (line: Pick<PredictedLineWire, 'species' | 'harmonic'>) => `${SPECIES_SYMBOLS[line.species] ?? line.species} n=${line.harmonic}`;

/** A span of more than a decade (stop/start ≥ 10) reads better on a log axis; a start at 0 Hz cannot be on one. */
export function chooseFrequencyAxis(startHz: number, stopHz: number): FrequencyAxis {
  return startHz > 0 && stopHz / startHz >= 10 ? 'logarithmic' : 'linear';
}

/**
 * Tick values for the frequency axis, about `target` of them: on a log axis spanning a decade or more,
 * 1-2-5 × 10ᵏ; otherwise (and on a linear axis) evenly spaced at a 1-2-5 step, so labels never crowd.
 */
export function frequencyTicks(minHz: number, maxHz: number, axis: FrequencyAxis, target = 6): number[] {
  if (!(maxHz > minHz)) return [minHz];
  if (axis === 'logarithmic' && minHz > 0 && maxHz / minHz >= 10) {
    const out: number[] = [];
    const mantissas = maxHz / minHz >= 1e3 ? [1] : [1, 2, 5];
    for (let k = Math.floor(Math.log10(minHz)); k <= Math.ceil(Math.log10(maxHz)); k++) {
      for (const m of mantissas) {
        const v = m * 10 ** k;
        if (v >= minHz * (1 - 1e-9) && v <= maxHz * (1 + 1e-9)) out.push(Number(v.toPrecision(12)));
      }
    }
    return out;
  }
  const raw = (maxHz - minHz) / target;
  const power = 10 ** Math.floor(Math.log10(raw));
  const step = ([1, 2, 5, 10].find((m) => m * power >= raw) ?? 10) * power;
  const out: number[] = [];
  for (let v = Math.ceil(minHz / step) * step; v <= maxHz + step * 1e-9; v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

/** Marker style per status: shape and label carry the meaning, colour only repeats it. */
export const PEAK_STYLE = {
  explained: { pointStyle: 'triangle', tag: '✓' },
  unexplained: { pointStyle: 'crossRot', tag: '?' },
} as const;

/** Short label beside a marked peak: "✓ e⁻ n=1" or "? unexplained". */
export function peakTag(peak: Pick<ExplainedPeakWire, 'status' | 'explainedBy'>): string {
  return peak.status === 'explained' && peak.explainedBy ? `${PEAK_STYLE.explained.tag} ${lineLabel(peak.explainedBy)}` : `${PEAK_STYLE.unexplained.tag} unexplained`;
}

export interface SpectrumColours {
  trace: string;
  explained: string;
  unexplained: string;
  line: string;
  lineFill: string;
  band: string;
  bandFill: string;
  text: string;
  grid: string;
}

/** "#rrggbb" (or "#rgb") with an alpha, as rgba() — canvas fill styles do not all take color-mix(). */
export function withAlpha(colour: string, alpha: number): string {
  const hex = /^#([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(colour.trim())?.[1];
  if (!hex) return colour;
  const full = hex.length === 3 ? [...hex].map((c) => c + c).join('') : hex;
  const [r, g, b] = [0, 2, 4].map((i) => parseInt(full.slice(i, i + 2), 16));
  return `rgba(${r}, ${g}, ${b}, ${alpha})`;
}

/** Colours from the theme's CSS variables (both themes), with fallbacks when none are set (tests). */
export function themeColours(): SpectrumColours {
  const style = typeof document !== 'undefined' ? getComputedStyle(document.documentElement) : null;
  const read = (name: string, fallback: string) => style?.getPropertyValue(`--fw-${name}`).trim() || fallback;
  const accent = read('accent', '#0f766e');
  const warning = read('warning', '#92400e');
  return {
    trace: read('fg', '#1f2a27'),
    explained: read('ok', '#166534'),
    unexplained: read('danger', '#b91c1c'),
    line: accent,
    lineFill: withAlpha(accent, 0.18),
    band: warning,
    bandFill: withAlpha(warning, 0.14),
    text: read('fg-muted', '#4b5753'),
    grid: read('border', '#d5dcd9'),
  };
}

type Point = { x: number; y: number; label?: string };

/** The trace as a line and the peaks as two point sets (explained, unexplained). Points with f ≤ 0 are dropped on a log axis. */
export function buildSpectrumData(input: { trace: SpectrumTrace | null; peaks: readonly ExplainedPeakWire[]; axis: FrequencyAxis; colours: SpectrumColours }): ChartData<'scatter', Point[]> {
  const { trace, peaks, axis, colours } = input;
  const keep = (f: number) => axis === 'linear' || f > 0;
  const tracePoints: Point[] = [];
  if (trace) for (let i = 0; i < trace.frequencyHz.length; i++) if (keep(trace.frequencyHz[i]!)) tracePoints.push({ x: trace.frequencyHz[i]!, y: trace.levelDbm[i]! });
  const peakPoints = (status: ExplainedPeakWire['status']) => peaks.filter((p) => p.status === status && keep(p.frequencyHz)).map((p) => ({ x: p.frequencyHz, y: p.levelDbm, label: `${peakTag(p)} (${p.source})` }));
  return {
    datasets: [
      {
        label: 'Trace',
        data: tracePoints,
        showLine: true,
        borderColor: colours.trace,
        borderWidth: 1,
        pointRadius: 0,
        pointHitRadius: 0,
        order: 3,
      },
      {
        label: 'Explained peak (triangle)',
        data: peakPoints('explained'),
        pointStyle: PEAK_STYLE.explained.pointStyle,
        pointRadius: 7,
        borderColor: colours.explained,
        backgroundColor: colours.explained,
        order: 1,
      },
      {
        label: 'Unexplained peak (cross)',
        data: peakPoints('unexplained'),
        pointStyle: PEAK_STYLE.unexplained.pointStyle,
        pointRadius: 8,
        borderWidth: 3,
        borderColor: colours.unexplained,
        backgroundColor: colours.unexplained,
        order: 0,
      },
    ],
  };
}

/**
 * Annotations: each predicted line inside [startHz, stopHz] as a band labelled "e⁻ n=1" (a band too
 * narrow to see still shows its border), each watch band as a shaded span labelled with its name, and a
 * short tag at every peak. Edges are clipped to the span.
 */
export function buildAnnotations(input: {
  lines: readonly PredictedLineWire[];
  watchBands: readonly SweepWatchBand[];
  peaks: readonly ExplainedPeakWire[];
  startHz: number;
  stopHz: number;
  colours: SpectrumColours;
}): Record<string, AnnotationOptions> {
  const { startHz, stopHz, colours } = input;
  const out: Record<string, AnnotationOptions> = {};
  const clip = (lowHz: number, highHz: number) => (highHz < startHz || lowHz > stopHz ? null : { xMin: Math.max(lowHz, startHz), xMax: Math.min(highHz, stopHz) });
  input.watchBands.forEach((band, i) => {
    const span = clip(band.lowerHz, band.upperHz);
    if (!span) return;
    out[`band-${i}`] = {
      type: 'box',
      ...span,
      backgroundColor: colours.bandFill,
      borderColor: colours.band,
      borderWidth: 1,
      borderDash: [4, 3],
      drawTime: 'beforeDatasetsDraw',
      label: { display: true, content: band.name, position: { x: 'start', y: 'end' }, color: colours.band, font: { size: 11 } },
    };
  });
  input.lines.forEach((line, i) => {
    const span = clip(line.lowHz, line.highHz);
    if (!span) return;
    out[`line-${i}`] = {
      type: 'box',
      ...span,
      backgroundColor: colours.lineFill,
      borderColor: colours.line,
      borderWidth: 2,
      drawTime: 'beforeDatasetsDraw',
      // Bottom right: peak tags sit above the peaks, the watch band's name bottom left.
      label: { display: true, content: lineLabel(line), position: { x: 'end', y: 'end' }, color: colours.line, font: { size: 12, weight: 'bold' } },
    };
  });
  input.peaks.forEach((peak, i) => {
    if (peak.frequencyHz < startHz || peak.frequencyHz > stopHz) return;
    out[`peak-${i}`] = {
      type: 'label',
      xValue: peak.frequencyHz,
      yValue: peak.levelDbm,
      yAdjust: -16,
      content: peakTag(peak),
      color: peak.status === 'explained' ? colours.explained : colours.unexplained,
      font: { size: 11, weight: 'bold' },
    };
  });
  return out;
}

/** Rows of the peak table, in frequency order. */
export function peakTableRows(peaks: readonly ExplainedPeakWire[]) {
  return [...peaks]
    .sort((a, b) => a.frequencyHz - b.frequencyHz)
    .map((p) => ({
      key: `${p.source}-${p.frequencyHz}`,
      frequency: formatFrequency(p.frequencyHz),
      level: `${p.levelDbm.toFixed(1)} dBm`,
      source: p.source === 'marker' ? 'Marker' : 'Trace',
      status: p.status === 'explained' ? 'Explained' : 'Unexplained',
      shape: p.status === 'explained' ? 'triangle' : 'cross',
      detail: `${p.label} (tolerance ± ${formatFrequency(p.toleranceHz)})`,
    }));
}

/** One sentence for the canvas's accessible name. */
export function spectrumSummary(input: { peaks: readonly ExplainedPeakWire[]; lines: readonly PredictedLineWire[]; watchBands: readonly SweepWatchBand[]; startHz: number; stopHz: number; hasTrace: boolean }): string {
  const explained = input.peaks.filter((p) => p.status === 'explained').length;
  const inSpan = input.lines.filter((l) => l.highHz >= input.startHz && l.lowHz <= input.stopHz);
  const bands = input.watchBands.map((b) => b.name);
  return [
    `Spectrum from ${formatFrequency(input.startHz)} to ${formatFrequency(input.stopHz)}${input.hasTrace ? '' : ' (no trace, markers only)'}.`,
    `${input.peaks.length} peak${input.peaks.length === 1 ? '' : 's'}: ${explained} explained, ${input.peaks.length - explained} unexplained.`,
    inSpan.length ? `Predicted lines in view: ${inSpan.map((l) => `${lineLabel(l)} ${formatFrequency(l.lowHz)}–${formatFrequency(l.highHz)}`).join('; ')}.` : 'No predicted line in view.',
    bands.length ? `Watch bands in view: ${bands.join(', ')}.` : 'No watch band in view.',
  ].join(' ');
}

/** Linear / log toggle for the frequency axis (log is refused for a span that starts at 0 Hz). */
export function FrequencyAxisToggle({ axis, logAllowed, onChange }: { axis: FrequencyAxis; logAllowed: boolean; onChange: (axis: FrequencyAxis) => void }) {
  return (
    <div role="group" aria-label="Frequency axis" className="flex gap-1">
      {(['linear', 'logarithmic'] as const).map((a) => (
        <button
          key={a}
          type="button"
          aria-pressed={axis === a}
          disabled={a === 'logarithmic' && !logAllowed}
          onClick={() => onChange(a)}
          className={`min-h-12 rounded-lg border px-3 text-sm ${axis === a ? 'border-accent bg-accent-soft text-accent-soft-fg font-semibold' : 'border-field-border bg-surface text-fg'}`}
        >
          {a === 'linear' ? 'Linear axis' : 'Log axis'}
        </button>
      ))}
    </div>
  );
}

/** The peaks as a table: the text version of the marks on the chart. */
export function SpectrumPeakTable({ peaks }: { peaks: readonly ExplainedPeakWire[] }) {
  const rows = peakTableRows(peaks);
  return (
    <table className="w-full text-left text-sm">
      <caption className="sr-only">Peaks of this sweep and the predicted lines that explain them</caption>
      <thead>
        <tr className="border-b border-border text-fg-muted">
          <th scope="col" className="py-1 pr-2">Frequency</th>
          <th scope="col" className="py-1 pr-2">Level</th>
          <th scope="col" className="py-1 pr-2">From</th>
          <th scope="col" className="py-1 pr-2">Mark</th>
          <th scope="col" className="py-1">Finding</th>
        </tr>
      </thead>
      <tbody>
        {rows.length === 0 ? (
          <tr>
            <td colSpan={5} className="py-2 text-fg-muted">
              No peaks: no markers were set and none stand above the noise floor.
            </td>
          </tr>
        ) : (
          rows.map((r) => (
            <tr key={r.key} className="border-b border-border">
              <td className="py-1 pr-2 tabular-nums">{r.frequency}</td>
              <td className="py-1 pr-2 tabular-nums">{r.level}</td>
              <td className="py-1 pr-2">{r.source}</td>
              <td className="py-1 pr-2">
                <span aria-hidden="true">{r.shape === 'triangle' ? '▲' : '✕'} </span>
                {r.status}
              </td>
              <td className="py-1">{r.detail}</td>
            </tr>
          ))
        )}
      </tbody>
    </table>
  );
}

export function SpectrumChart(props: SpectrumChartProps) {
  const { trace, peaks, lines, watchBands, startHz, stopHz, traceNote } = props;
  const [axis, setAxis] = useState<FrequencyAxis>(props.initialAxis ?? chooseFrequencyAxis(startHz, stopHz));
  const { theme } = useTheme();
  const logAllowed = startHz > 0;
  const shownAxis: FrequencyAxis = logAllowed ? axis : 'linear';

  const { data, options } = useMemo(() => {
    void theme; // colours are read again when the theme changes
    const colours = themeColours();
    const chartData = buildSpectrumData({ trace, peaks, axis: shownAxis, colours });
    const chartOptions: ChartOptions<'scatter'> = {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      parsing: false,
      scales: {
        x: {
          type: shownAxis,
          min: startHz,
          max: stopHz,
          title: { display: true, text: 'Frequency', color: colours.text },
          ticks: { color: colours.text, maxRotation: 0, callback: (value) => formatFrequency(Number(value)) },
          afterBuildTicks: (scale) => {
            scale.ticks = frequencyTicks(startHz, stopHz, shownAxis).map((value) => ({ value }));
          },
          grid: { color: colours.grid },
        },
        y: {
          type: 'linear',
          title: { display: true, text: 'Level (dBm)', color: colours.text },
          ticks: { color: colours.text },
          grid: { color: colours.grid },
        },
      },
      plugins: {
        legend: { labels: { color: colours.text, usePointStyle: true } },
        tooltip: {
          callbacks: {
            label: (ctx) => {
              const point = ctx.raw as Point;
              return `${formatFrequency(point.x)}, ${point.y.toFixed(1)} dBm${point.label ? ` — ${point.label}` : ''}`;
            },
          },
        },
        annotation: { annotations: buildAnnotations({ lines, watchBands, peaks, startHz, stopHz, colours }) },
      },
    };
    return { data: chartData, options: chartOptions };
  }, [trace, peaks, lines, watchBands, startHz, stopHz, shownAxis, theme]);

  const summary = spectrumSummary({ peaks, lines, watchBands, startHz, stopHz, hasTrace: trace !== null });

  return (
    <figure className="flex flex-col gap-3 rounded-xl border border-border bg-surface p-3" data-testid="spectrum-chart">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <figcaption className="text-sm text-fg-muted">{summary}</figcaption>
        <FrequencyAxisToggle axis={shownAxis} logAllowed={logAllowed} onChange={setAxis} />
      </div>
      {trace === null && traceNote ? <p className="text-sm text-fg-muted">{traceNote}</p> : null}
      <div className="relative h-80 w-full">
        <Chart type="scatter" data={data} options={options} role="img" aria-label={summary} />
      </div>
      <SpectrumPeakTable peaks={peaks} />
    </figure>
  );
}

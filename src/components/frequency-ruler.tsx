import { formatFrequency } from '@shared/units';
import { rulerDomainFor, rulerSpan, rulerTicks, rulerX } from '@/lib/ruler-geometry';

const WIDTH = 360;
const AXIS_Y = 46;
const PAD_X = 10;

/** A predicted line band: the capture form's feedback lines and a room's lines both fit. */
export interface RulerLine {
  speciesId: string;
  speciesName: string;
  harmonic: number;
  lowHz: number;
  highHz: number;
  /** Where the tick is drawn, Hz. */
  centreHz: number;
  /** The watch bands the line touches. */
  hits: readonly { watchBandId: string }[];
}

export interface RulerWatchBand {
  id: string;
  name: string;
  lowerHz: number;
  upperHz: number;
}

export interface FrequencyRulerProps {
  lines: readonly RulerLine[];
  watchBands: readonly RulerWatchBand[];
}

/**
 * A log-frequency ruler: watch bands as shaded spans, electron lines as ticks above the axis and ion
 * lines below it. A line inside a watch band is drawn thick in the danger colour with a ring on top,
 * so a hit reads at a glance even without colour.
 */
export function FrequencyRuler({ lines, watchBands }: FrequencyRulerProps) {
  const domain = rulerDomainFor(lines.flatMap((l) => [l.lowHz, l.highHz]));
  const inner = WIDTH - 2 * PAD_X;
  const x = (f: number) => PAD_X + rulerX(f, domain, inner);
  const ticks = rulerTicks(domain);
  const hitBandIds = new Set(lines.flatMap((l) => l.hits.map((h) => h.watchBandId)));
  const summary = lines.map((l) => `${l.speciesName} n=${l.harmonic} ${formatFrequency(l.centreHz)}${l.hits.length ? ' (in a watch band)' : ''}`).join('; ');
  return (
    <svg viewBox={`0 0 ${WIDTH} 84`} className="w-full" role="img" aria-label={`Frequency ruler, log scale: ${summary}`} data-testid="frequency-ruler">
      {watchBands.map((b) => {
        const span = rulerSpan(b.lowerHz, b.upperHz, domain, inner);
        if (!span) return null;
        const hit = hitBandIds.has(b.id);
        return (
          <rect
            key={b.id}
            x={PAD_X + span.x0}
            width={Math.max(2, span.x1 - span.x0)}
            y={14}
            height={AXIS_Y + 10 - 14}
            className={hit ? 'fill-danger-soft stroke-danger' : 'fill-warning-soft stroke-warning'}
            strokeWidth={hit ? 1.5 : 0.75}
          >
            <title>{`${b.name}: ${formatFrequency(b.lowerHz)} – ${formatFrequency(b.upperHz)}`}</title>
          </rect>
        );
      })}
      <line x1={PAD_X} x2={WIDTH - PAD_X} y1={AXIS_Y} y2={AXIS_Y} className="stroke-fg" strokeWidth={1.5} />
      {ticks.map((t, i) => (
        <g key={t.frequencyHz}>
          <line x1={x(t.frequencyHz)} x2={x(t.frequencyHz)} y1={AXIS_Y} y2={AXIS_Y + 5} className="stroke-fg" strokeWidth={1} />
          <text x={x(t.frequencyHz)} y={80} textAnchor={i === 0 ? 'start' : i === ticks.length - 1 ? 'end' : 'middle'} className="fill-fg" fontSize={11}>
            {t.label}
          </text>
        </g>
      ))}
      {lines.map((l) => {
        const hit = l.hits.length > 0;
        const electron = l.speciesId === 'electron';
        const y0 = electron ? AXIS_Y - 4 - (hit ? 28 : 20) : AXIS_Y + 2;
        const y1 = electron ? AXIS_Y : AXIS_Y + 2 + (hit ? 20 : 14);
        const cx = x(l.centreHz);
        const span = rulerSpan(l.lowHz, l.highHz, domain, inner);
        return (
          <g key={`${l.speciesId}-${l.harmonic}`}>
            {span && span.x1 - span.x0 > 1 && (
              <rect x={PAD_X + span.x0} width={span.x1 - span.x0} y={Math.min(y0, y1)} height={Math.abs(y1 - y0)} className={hit ? 'fill-danger' : 'fill-accent'} opacity={0.25} />
            )}
            <line x1={cx} x2={cx} y1={y0} y2={y1} className={hit ? 'stroke-danger' : 'stroke-accent'} strokeWidth={hit ? 3.5 : 2} />
            {hit && <circle cx={cx} cy={electron ? y0 : y1} r={4} className="fill-surface stroke-danger" strokeWidth={2} />}
            <title>{`${l.speciesName}, n = ${l.harmonic}: ${formatFrequency(l.lowHz)} – ${formatFrequency(l.highHz)}`}</title>
          </g>
        );
      })}
      <text x={PAD_X} y={9} fontSize={10} className="fill-fg-muted">
        electron lines ↑ · ion lines ↓ · shaded: watch bands
      </text>
    </svg>
  );
}

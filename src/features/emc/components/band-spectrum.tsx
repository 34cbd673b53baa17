import type { WatchBand } from '@shared/schemas/watch-band';
import { SEVERITIES } from '@shared/schemas/vocabulary';
import { formatFrequency } from '@shared/units';
import { rulerDomainFor, rulerSpan, rulerTicks, rulerX } from '@/lib/ruler-geometry';
import { SEVERITY_LABELS } from './labels';

const WIDTH = 720;
const PAD_X = 16;
const ROW = 22;
const TOP = 8;
const LABEL_W = 64;
const LEFT = PAD_X + LABEL_W;

/** Fill per severity row, from the theme's tokens, so both themes keep their contrast. */
const FILL: Record<WatchBand['severity'], string> = {
  low: 'fill-fg-muted',
  medium: 'fill-accent',
  high: 'fill-warning',
  critical: 'fill-danger',
};

/**
 * Every watched band on one log-frequency axis, a row per severity (critical on top), so gaps and
 * clusters read at a glance. A band too narrow to see is drawn at least 3 units wide.
 */
export function BandSpectrum({ bands }: { bands: WatchBand[] }) {
  if (bands.length === 0) return null;
  const domain = rulerDomainFor(bands.flatMap((b) => [b.lowerHz, b.upperHz]));
  const inner = WIDTH - 2 * PAD_X - LABEL_W;
  const rows = [...SEVERITIES].reverse();
  const axisY = TOP + rows.length * ROW + 4;
  const height = axisY + 28;
  const summary = rows
    .map((s) => {
      const these = bands.filter((b) => b.severity === s);
      return these.length ? `${SEVERITY_LABELS[s]}: ${these.map((b) => `${b.name} ${formatFrequency(b.lowerHz)}–${formatFrequency(b.upperHz)}`).join(', ')}` : null;
    })
    .filter(Boolean)
    .join('. ');
  return (
    <figure className="flex flex-col gap-2 rounded-xl border border-border bg-surface p-3">
      <svg viewBox={`0 0 ${WIDTH} ${height}`} className="w-full" role="img" aria-label={`Watched bands on a log frequency axis. ${summary}`} data-testid="band-spectrum">
        {rows.map((s, i) => (
          <g key={s}>
            <text x={PAD_X} y={TOP + i * ROW + 15} className="fill-fg-muted" fontSize={11}>
              {SEVERITY_LABELS[s]}
            </text>
            {bands
              .filter((b) => b.severity === s)
              .map((b) => {
                const span = rulerSpan(b.lowerHz, b.upperHz, domain, inner);
                if (!span) return null;
                const w = Math.max(3, span.x1 - span.x0);
                return (
                  <rect key={b.id} x={LEFT + span.x0 - (w - (span.x1 - span.x0)) / 2} y={TOP + i * ROW + 3} width={w} height={ROW - 6} rx={2} className={FILL[s]} opacity={0.85}>
                    <title>{`${b.name}: ${formatFrequency(b.lowerHz)} – ${formatFrequency(b.upperHz)}`}</title>
                  </rect>
                );
              })}
          </g>
        ))}
        <line x1={LEFT} x2={WIDTH - PAD_X} y1={axisY} y2={axisY} className="stroke-border" strokeWidth={2} />
        {rulerTicks(domain).map((t, i, all) => {
          const x = LEFT + rulerX(t.frequencyHz, domain, inner);
          return (
            <g key={t.frequencyHz}>
              <line x1={x} x2={x} y1={axisY} y2={axisY + 6} className="stroke-fg-muted" />
              <text x={x} y={axisY + 20} textAnchor={i === 0 ? 'start' : i === all.length - 1 ? 'end' : 'middle'} className="fill-fg" fontSize={12}>
                {t.label}
              </text>
            </g>
          );
        })}
      </svg>
      <figcaption className="text-sm text-fg-muted">Each bar is a watched band; the axis is logarithmic, one decade per tick. Hover or tap a bar for its edges; the table below lists them all.</figcaption>
    </figure>
  );
}

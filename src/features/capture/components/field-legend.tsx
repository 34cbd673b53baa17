import { memo } from 'react';
import { fromSi } from '@shared/units';
import { decadeTicks, fieldPosition, NO_READING_COLOUR, rampGradientCss, type FieldDomain } from '@/lib/colour-scale';
import type { FieldUnit } from '../lib/reading-form';

/** A decade in the surveyor's unit as plain digits ("0.01 mT", "100 mT"), never exponent notation for the usual range. */
export function legendLabel(fieldT: number, unit: FieldUnit): string {
  return `${Number(fromSi('fluxDensity', fieldT, unit).toPrecision(3))} ${unit}`;
}

/** The plan's colour key: the log-|B| ramp with decade ticks in the surveyor's unit. */
export const FieldLegend = memo(function FieldLegend({ domain, unit }: { domain: FieldDomain; unit: FieldUnit }) {
  const ticks = decadeTicks(domain);
  return (
    <figure className="rounded-lg border border-border bg-surface px-3 py-2 text-xs text-fg" aria-label="Colour key: latest |B| on a log scale" data-testid="field-legend">
      <figcaption className="mb-1 flex items-center justify-between gap-2 font-bold">
        <span>Latest |B| (log scale)</span>
        <span className="flex items-center gap-1 font-normal">
          <span aria-hidden className="inline-block h-3 w-3 rounded-full border-2" style={{ borderColor: NO_READING_COLOUR }} />
          no reading
        </span>
      </figcaption>
      <div className="h-3 rounded" style={{ background: rampGradientCss() }} aria-hidden />
      <div className="relative mt-1 h-4">
        {ticks.map((t, i) => {
          const left = fieldPosition(t, domain) * 100;
          const align = i === 0 ? 'translate-x-0' : i === ticks.length - 1 ? '-translate-x-full' : '-translate-x-1/2';
          return (
            <span key={t} className={`absolute whitespace-nowrap ${align}`} style={{ left: `${left}%` }}>
              {legendLabel(t, unit)}
            </span>
          );
        })}
      </div>
    </figure>
  );
});

import type { SurveyMap } from '@shared/schemas/survey-map';
import { decadeTicks, fieldPosition, NO_READING_COLOUR, rampGradientCss, type FieldDomain } from '@/lib/colour-scale';
import { fieldLabel, type MapFieldUnit } from '../lib/units';
import { zoneColour } from './map-canvas';

/** The map's key: the log-|B| ramp with decade ticks in the chosen unit, the zones and their lines, and the line styles. */
export function MapLegend({ map, domain, unit, comparing }: { map: SurveyMap; domain: FieldDomain; unit: MapFieldUnit; comparing: string | null }) {
  const ticks = decadeTicks(domain);
  const thresholdsT = map.zoneSet.thresholds.map((t) => t.fieldT);
  return (
    <figure className="flex flex-col gap-3 rounded-lg border border-border bg-surface px-3 py-2 text-sm text-fg" aria-label="Map key" data-testid="map-legend">
      <div>
        <figcaption className="mb-1 flex items-center justify-between gap-2 font-bold">
          <span>Latest |B| at each station (log scale)</span>
          <span className="flex items-center gap-1 font-normal">
            <span aria-hidden className="inline-block h-3 w-3 rounded-full border-2" style={{ borderColor: NO_READING_COLOUR }} />
            no reading
          </span>
        </figcaption>
        <div className="h-3 rounded" style={{ background: rampGradientCss() }} aria-hidden />
        <div className="relative mt-1 h-5">
          {ticks.map((t, i) => {
            const align = i === 0 ? 'translate-x-0' : i === ticks.length - 1 ? '-translate-x-full' : '-translate-x-1/2';
            return (
              <span key={t} className={`absolute whitespace-nowrap ${align}`} style={{ left: `${fieldPosition(t, domain) * 100}%` }}>
                {fieldLabel(t, unit)}
              </span>
            );
          })}
        </div>
      </div>
      <div>
        <p className="font-bold">Zones: {map.zoneSet.name}</p>
        <p className="text-fg-muted">Following {map.zoneSet.edition}</p>
        <ul className="flex flex-col gap-1">
          <li className="flex items-center gap-2">
            <span aria-hidden className="inline-block h-4 w-6 rounded border border-border" style={{ background: zoneColour(-1, thresholdsT, domain) }} />
            {map.zoneSet.belowLabel}
          </li>
          {map.zoneSet.thresholds.map((t, i) => (
            <li key={t.fieldT} className="flex items-center gap-2" data-testid="legend-zone">
              <span aria-hidden className="inline-block h-4 w-6 rounded border border-border" style={{ background: zoneColour(i, thresholdsT, domain) }} />
              <span>
                <strong>≥ {fieldLabel(t.fieldT, unit)}</strong> {t.name}
              </span>
            </li>
          ))}
        </ul>
      </div>
      <ul className="flex flex-col gap-1">
        <li className="flex items-center gap-2">
          <span aria-hidden className="inline-block w-8 border-t-[3px] border-fg" /> isogauss line of this survey (labelled)
        </li>
        {map.extraLevelsT.length > 0 && (
          <li className="flex items-center gap-2">
            <span aria-hidden className="inline-block w-8 border-t-2 border-dotted border-fg" /> added line
          </li>
        )}
        {comparing && (
          <li className="flex items-center gap-2">
            <span aria-hidden className="inline-block w-8 border-t-[3px] border-dashed border-ring" /> same line in {comparing}
          </li>
        )}
        <li className="flex items-center gap-2">
          <span aria-hidden className="inline-block w-8 border-t-2 border-dashed border-accent" /> dipole fit, extrapolated (when shown)
        </li>
      </ul>
    </figure>
  );
}

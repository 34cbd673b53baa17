/**
 * One level of the survey map in Leaflet's CRS.Simple (one map unit = one plan metre): the plan image,
 * zones shaded between the isogauss lines, the lines themselves with their labels, rooms coloured by
 * their highest class, stations coloured by |B| on the log scale, repeat-reading groups, the dipole-fit
 * layer with its residuals, and (when comparing) the earlier survey's lines dashed.
 *
 * Everything drawn here was computed on the server; this component only draws. Stations are drawn
 * imperatively on one canvas (thousands of React children would be slow); a tap finds the nearest
 * station in metres.
 */
import 'leaflet/dist/leaflet.css';
import L from 'leaflet';
import { Fragment, memo, useEffect, useMemo, useRef } from 'react';
import { CircleMarker, ImageOverlay, MapContainer, Polygon, Polyline, Tooltip, useMap, useMapEvents } from 'react-leaflet';
import type { LevelMap, MapContour, MapStation } from '@shared/schemas/survey-map';
import { fieldColour, fieldPosition, rampColour, type FieldDomain } from '@/lib/colour-scale';
import { planImageBoundsM, pointsBoundsM, type MetreBounds } from '@/lib/plan-frame';
import { fieldLabel, type MapFieldUnit } from '../lib/units';

export interface MapLayers {
  stations: boolean;
  contours: boolean;
  zones: boolean;
  rooms: boolean;
  repeats: boolean;
  dipole: boolean;
}

export const DEFAULT_LAYERS: MapLayers = { stations: true, contours: true, zones: true, rooms: false, repeats: true, dipole: false };

export interface MapCanvasProps {
  orgImageUrl: string | null;
  level: LevelMap;
  thresholdsT: readonly number[];
  domain: FieldDomain;
  unit: MapFieldUnit;
  layers: MapLayers;
  /** The earlier survey's lines, drawn dashed (comparison). */
  earlierContours?: readonly MapContour[] | null;
  selectedStationId: string | null;
  onSelectStation: (stationId: string | null) => void;
  theme: string;
  printable?: boolean;
}

function cssVar(name: string, fallback: string): string {
  if (typeof document === 'undefined') return fallback;
  return getComputedStyle(document.documentElement).getPropertyValue(name).trim() || fallback;
}

const STATION_RADIUS_PX = 6;
/** Labels per line: enough to read every ring of a level, few enough not to bury the plan. */
const MAX_LABELS_PER_LINE = 6;
/** Residual markers drawn at most; beyond, the panel's table carries them. */
const MAX_RESIDUAL_MARKERS = 3000;

const toLatLngs = (polygons: MapContour['polygons']) => polygons.map((polygon) => polygon.map((ring) => ring.map(([x, y]) => [y, x] as [number, number])));

/** The colour of a zone (index in the ascending thresholds): the ramp colour of its lower line. */
export function zoneColour(zoneIndex: number | null, thresholdsT: readonly number[], domain: FieldDomain): string {
  if (zoneIndex === null || zoneIndex < 0) return cssVar('--fw-surface', '#f5f2ec');
  const t = thresholdsT[zoneIndex];
  return t === undefined ? '#8b938f' : rampColour(fieldPosition(t, domain));
}

function StationsLayer({ stations, domain, theme }: { stations: readonly MapStation[]; domain: FieldDomain; theme: string }) {
  const map = useMap();
  const renderer = useMemo(() => L.canvas({ padding: 0.5 }), []);
  const group = useRef<L.LayerGroup | null>(null);
  useEffect(() => {
    const layer = L.layerGroup().addTo(map);
    group.current = layer;
    return () => {
      layer.remove();
      group.current = null;
    };
  }, [map]);
  useEffect(() => {
    const layer = group.current;
    if (!layer) return;
    layer.clearLayers();
    const outline = cssVar('--fw-fg', '#101918');
    for (const s of stations) {
      L.circleMarker([s.yM, s.xM], {
        renderer,
        radius: STATION_RADIUS_PX,
        interactive: false,
        color: s.fieldT === null ? fieldColour(null, domain) : outline,
        weight: s.fieldT === null ? 3 : 1.2,
        fill: s.fieldT !== null,
        fillColor: fieldColour(s.fieldT, domain),
        fillOpacity: 1,
      }).addTo(layer);
    }
    // Leaflet's canvas draws in the next frame: the mark (read by tests/bench/map.bench.ts) is the moment the dots are on screen.
    const frame = requestAnimationFrame(() => {
      map.getContainer().dataset.stationsDrawn = String(stations.length);
      if (typeof performance.mark === 'function') performance.mark('survey-map:stations-drawn', { detail: { count: stations.length } });
    });
    return () => cancelAnimationFrame(frame);
  }, [map, renderer, stations, domain, theme]);
  return null;
}

function TapToSelect({ stations, onSelect }: { stations: readonly MapStation[]; onSelect: (id: string | null) => void }) {
  const map = useMapEvents({
    click(event) {
      // CRS.Simple: one metre is 2^zoom screen pixels; a tap within 16 px picks the nearest station.
      const radiusM = 16 / 2 ** map.getZoom();
      let best: MapStation | null = null;
      let bestD = radiusM;
      for (const s of stations) {
        const d = Math.hypot(s.xM - event.latlng.lng, s.yM - event.latlng.lat);
        if (d <= bestD) {
          bestD = d;
          best = s;
        }
      }
      onSelect(best?.id ?? null);
    },
  });
  return null;
}

/** Fits the view to the level when the level changes (not on every layer switch). */
function FitLevel({ bounds, levelId }: { bounds: MetreBounds; levelId: string }) {
  const map = useMap();
  const fitted = useRef<string | null>(null);
  useEffect(() => {
    if (fitted.current === levelId) return;
    fitted.current = levelId;
    map.fitBounds(bounds, { animate: false });
  }, [map, bounds, levelId]);
  return null;
}

function DrawnMark({ contours }: { contours: number }) {
  const map = useMap();
  useEffect(() => {
    map.getContainer().dataset.contoursDrawn = String(contours);
  }, [map, contours]);
  return null;
}

function ContourLabels({ contour, unit, className }: { contour: MapContour; unit: MapFieldUnit; className: string }) {
  return (
    <>
      {contour.labelPoints.slice(0, MAX_LABELS_PER_LINE).map(([x, y], i) => (
        <CircleMarker key={i} center={[y, x]} radius={1} pathOptions={{ opacity: 0, fillOpacity: 0 }} interactive={false}>
          <Tooltip permanent direction="center" className={className}>
            {fieldLabel(contour.levelT, unit)}
          </Tooltip>
        </CircleMarker>
      ))}
    </>
  );
}

export const MapCanvas = memo(function MapCanvas(props: MapCanvasProps) {
  const { level, layers, domain, unit, thresholdsT, earlierContours, theme, printable } = props;
  const plan = level.plan;
  const frame = plan ? planImageBoundsM(plan) : null;
  const bounds: MetreBounds =
    frame?.bounds ??
    pointsBoundsM([...level.stations.map((s) => [s.xM, s.yM] as const), ...level.rooms.flatMap((r) => r.polygon.map(([x, y]) => [x, y] as const))], 2) ?? [
      [0, 0],
      [10, 10],
    ];
  const lineColour = cssVar('--fw-fg', '#101918');
  const earlierColour = cssVar('--fw-ring', '#a15726');
  const accent = cssVar('--fw-accent', '#145955');
  const warning = cssVar('--fw-warning', '#7a4a00');
  const ascending = [...level.contours].sort((a, b) => a.levelT - b.levelT);
  const selected = level.stations.find((s) => s.id === props.selectedStationId) ?? null;
  const residualCount = level.dipoles.reduce((n, d) => n + d.residuals.length, 0);
  const stationById = useMemo(() => new Map(level.stations.map((s) => [s.id, s])), [level.stations]);

  return (
    <div
      role="region"
      aria-label={`Survey map of ${level.level.name}`}
      data-testid="survey-map"
      className={`relative isolate overflow-hidden rounded-xl border-2 border-border bg-surface-sunken ${printable ? 'h-[70vh] print:h-[60vh]' : 'h-[65vh] min-h-96'}`}
    >
      <MapContainer
        key={level.level.id}
        crs={L.CRS.Simple}
        bounds={L.latLngBounds(bounds)}
        minZoom={-4}
        maxZoom={7}
        zoomSnap={0.25}
        preferCanvas
        attributionControl={false}
        zoomControl={!printable}
        className="h-full w-full"
        style={{ background: 'transparent' }}
      >
        <FitLevel bounds={bounds} levelId={level.level.id} />
        {plan && props.orgImageUrl && <ImageOverlay key={`${plan.id}-${theme}`} url={props.orgImageUrl} bounds={L.latLngBounds(frame!.bounds)} className={theme === 'hall' ? 'brightness-75' : ''} />}

        {layers.zones &&
          ascending
            .filter((c) => c.zoneIndex !== null && c.polygons.length > 0)
            .map((c) => (
              <Polygon
                key={`zone-${c.levelT}`}
                positions={toLatLngs(c.polygons)}
                pathOptions={{ stroke: false, fill: true, fillColor: zoneColour(c.zoneIndex, thresholdsT, domain), fillOpacity: 0.28, interactive: false }}
              />
            ))}

        {layers.rooms &&
          level.rooms.map((r) => (
            <Polygon
              key={r.id}
              positions={r.polygon.map(([x, y]) => [y, x] as [number, number])}
              pathOptions={{ color: lineColour, weight: 1, fill: true, fillColor: zoneColour(r.zoneIndex, thresholdsT, domain), fillOpacity: r.zoneIndex !== null && r.zoneIndex >= 0 ? 0.45 : 0.1 }}
            >
              <Tooltip sticky>
                {r.name}
                {r.maxFieldT !== null ? ` · highest ${fieldLabel(r.maxFieldT, unit)}` : ' · no readings'}
              </Tooltip>
            </Polygon>
          ))}

        {layers.contours &&
          ascending.map((c) =>
            c.polygons.length === 0 ? null : (
              <Fragment key={`line-${c.levelT}`}>
                <Polygon positions={toLatLngs(c.polygons)} pathOptions={{ color: lineColour, weight: c.zoneIndex === null ? 1.5 : 2.5, dashArray: c.zoneIndex === null ? '2 4' : undefined, fill: false, interactive: false }} />
                <ContourLabels contour={c} unit={unit} className="survey-map-label" />
              </Fragment>
            ),
          )}

        {earlierContours?.map((c) =>
          c.polygons.length === 0 ? null : (
            <Polygon key={`earlier-${c.levelT}`} positions={toLatLngs(c.polygons)} pathOptions={{ color: earlierColour, weight: 2.5, dashArray: '8 6', fill: false, interactive: false }} />
          ),
        )}

        {layers.dipole &&
          level.dipoles
            .filter((d) => d.ok)
            .map((d) => (
              <Fragment key={`dipole-${d.sourceId}`}>
                {d.contours.map((c) => (
                  <Polyline key={c.levelT} positions={c.ring.map(([x, y]) => [y, x] as [number, number])} pathOptions={{ color: accent, weight: 2, dashArray: '3 5', interactive: false }} />
                ))}
                {residualCount <= MAX_RESIDUAL_MARKERS &&
                  d.residuals.map((r) => {
                    const s = stationById.get(r.stationId);
                    if (!s) return null;
                    return (
                      <CircleMarker
                        key={r.stationId}
                        center={[s.yM, s.xM]}
                        radius={STATION_RADIUS_PX + Math.min(12, Math.abs(r.relativeResidual) * 30)}
                        pathOptions={{ color: r.relativeResidual >= 0 ? warning : accent, weight: 2, fill: false }}
                      >
                        <Tooltip>
                          {d.sourceName}: measured {r.relativeResidual >= 0 ? '+' : ''}
                          {(r.relativeResidual * 100).toFixed(1)} % against the fit
                        </Tooltip>
                      </CircleMarker>
                    );
                  })}
              </Fragment>
            ))}

        {layers.stations && <StationsLayer stations={level.stations} domain={domain} theme={theme} />}

        {layers.repeats &&
          level.repeatGroups.map((g, i) => (
            <CircleMarker key={`${g.stationIds.join(',')}-${i}`} center={[g.yM, g.xM]} radius={STATION_RADIUS_PX + 6} pathOptions={{ color: g.disagree ? warning : accent, weight: 3, dashArray: g.disagree ? undefined : '4 3', fill: false }}>
              <Tooltip>
                {g.count} readings · mean {fieldLabel(g.meanT, unit)} · spread {fieldLabel(g.spreadT, unit)}
                {g.maxEn !== null ? ` · Eₙ ${g.maxEn.toFixed(2)}` : ''}
                {g.disagree ? ' · disagree' : ''}
              </Tooltip>
            </CircleMarker>
          ))}

        {level.sources.map((s) => (
          <CircleMarker key={s.id} center={[s.yM, s.xM]} radius={8} pathOptions={{ color: lineColour, weight: 3, fillColor: cssVar('--fw-bg', '#ffffff'), fillOpacity: 1 }}>
            <Tooltip>{s.name}</Tooltip>
          </CircleMarker>
        ))}

        {selected && <CircleMarker center={[selected.yM, selected.xM]} radius={STATION_RADIUS_PX + 6} pathOptions={{ color: earlierColour, weight: 4, fill: false, interactive: false }} />}
        <TapToSelect stations={level.stations} onSelect={props.onSelectStation} />
        <DrawnMark contours={layers.contours ? ascending.filter((c) => c.polygons.length > 0).length : 0} />
      </MapContainer>
      {frame && !frame.calibrated && (
        <p className="absolute bottom-2 left-2 z-[500] rounded bg-warning-soft px-2 py-1 text-sm font-bold text-warning">Plan not calibrated: positions are drawn one metre per pixel</p>
      )}
      {!plan && <p className="absolute left-2 top-2 z-[500] rounded bg-warning-soft px-2 py-1 text-sm font-bold text-warning">No plan for this level: stations are drawn on their own</p>}
    </div>
  );
});

/**
 * The plan view: the level's plan image in Leaflet's CRS.Simple with one map unit = one plan metre,
 * stations as canvas circle markers coloured by their latest |B| (log scale), the rooms' outlines, the
 * current walk's path, re-measure badges, and tap-to-pick-or-place.
 *
 * Stations are drawn imperatively on one shared canvas renderer rather than as thousands of React
 * children: 5,000 markers stay one <canvas> and one pass, and a tap is hit-tested in metres
 * (lib/hit-test) instead of by Leaflet's per-layer event handling.
 */
import 'leaflet/dist/leaflet.css';
import L from 'leaflet';
import { memo, useEffect, useMemo, useRef } from 'react';
import { ImageOverlay, MapContainer, Marker, Polygon, Polyline, useMap, useMapEvents } from 'react-leaflet';
import { useTheme } from '@/lib/theme';
import { fieldColour, type FieldDomain } from '../lib/colour-scale';
import { nearestWithin, TAP_RADIUS_PX } from '../lib/hit-test';
import { planImageBoundsM, type PlanCalibrationInput } from '../lib/plan-frame';

export interface PlanStation {
  id: string;
  xM: number;
  yM: number;
  latestFieldT: number | null;
  label: string | null;
}

export interface PlanRoom {
  id: string;
  name: string;
  polygon: ReadonlyArray<readonly [number, number]>;
}

export interface PlanViewProps {
  plan: PlanCalibrationInput;
  imageUrl: string | null | undefined;
  stations: readonly PlanStation[];
  rooms: readonly PlanRoom[];
  domain: FieldDomain;
  selectedStationId: string | null;
  pendingPoint: { xM: number; yM: number } | null;
  walkPath: ReadonlyArray<readonly [number, number]>;
  remeasureStationIds: ReadonlySet<string>;
  onPick: (stationId: string) => void;
  onPlace: (point: { xM: number; yM: number }) => void;
  className?: string;
}

function cssVar(name: string, fallback: string): string {
  if (typeof document === 'undefined') return fallback;
  return getComputedStyle(document.documentElement).getPropertyValue(name).trim() || fallback;
}

/** Radius of a station dot, screen px: big enough to see in a dim room, small enough not to hide the plan. */
const STATION_RADIUS_PX = 7;

interface DrawnStation {
  marker: L.CircleMarker;
  xM: number;
  yM: number;
  latestFieldT: number | null;
}

/**
 * Keeps one circle marker per station and touches only what changed: a save re-colours one dot
 * instead of rebuilding 5,000. A new colour domain or theme restyles every dot.
 */
function StationsLayer({ stations, domain, theme }: { stations: readonly PlanStation[]; domain: FieldDomain; theme: string }) {
  const map = useMap();
  const renderer = useMemo(() => L.canvas({ padding: 0.5 }), []);
  const drawn = useRef(new Map<string, DrawnStation>());
  const group = useMemo(() => L.layerGroup(), []);
  const styleKey = useRef('');

  useEffect(() => {
    group.addTo(map);
    const markers = drawn.current;
    return () => {
      group.remove();
      markers.clear();
      group.clearLayers();
    };
  }, [map, group]);

  useEffect(() => {
    const outline = cssVar('--fw-fg', '#101918');
    const style = (fieldT: number | null): L.CircleMarkerOptions => ({
      color: fieldT !== null ? outline : fieldColour(null, domain),
      weight: fieldT !== null ? 1.5 : 3,
      fill: fieldT !== null,
      fillColor: fieldColour(fieldT, domain),
      fillOpacity: 1,
    });
    const key = `${domain.minT}:${domain.maxT}:${theme}:${outline}`;
    const restyleAll = key !== styleKey.current;
    styleKey.current = key;
    const markers = drawn.current;
    const seen = new Set<string>();
    for (const s of stations) {
      seen.add(s.id);
      const current = markers.get(s.id);
      if (!current) {
        const marker = L.circleMarker([s.yM, s.xM], { renderer, radius: STATION_RADIUS_PX, interactive: false, ...style(s.latestFieldT) }).addTo(group);
        markers.set(s.id, { marker, xM: s.xM, yM: s.yM, latestFieldT: s.latestFieldT });
        continue;
      }
      if (current.xM !== s.xM || current.yM !== s.yM) {
        current.marker.setLatLng([s.yM, s.xM]);
        current.xM = s.xM;
        current.yM = s.yM;
      }
      if (restyleAll || current.latestFieldT !== s.latestFieldT) {
        current.marker.setStyle(style(s.latestFieldT));
        current.latestFieldT = s.latestFieldT;
      }
    }
    for (const [id, d] of markers) {
      if (!seen.has(id)) {
        d.marker.remove();
        markers.delete(id);
      }
    }
    // Leaflet's canvas renderer draws in the next animation frame; this callback runs after it, so the
    // mark (read by tests/bench/capture.bench.ts) is the moment the dots are on the canvas.
    const frame = requestAnimationFrame(() => {
      map.getContainer().dataset.stationsDrawn = String(stations.length);
      if (typeof performance.mark === 'function') performance.mark('capture:stations-drawn', { detail: { count: stations.length } });
    });
    return () => cancelAnimationFrame(frame);
  }, [map, renderer, group, stations, domain, theme]);
  return null;
}

function TapHandler({ stations, onPick, onPlace }: Pick<PlanViewProps, 'stations' | 'onPick' | 'onPlace'>) {
  const map = useMapEvents({
    click(event) {
      const tap = { xM: event.latlng.lng, yM: event.latlng.lat };
      // CRS.Simple: one map unit is 2^zoom screen pixels.
      const radiusM = TAP_RADIUS_PX / 2 ** map.getZoom();
      const hit = nearestWithin(tap, stations, radiusM);
      if (hit) onPick(hit.id);
      else onPlace(tap);
    },
  });
  return null;
}

// Icon markup uses classes, never style attributes: the app's CSP (style-src 'self') refuses inline styles.
function badgeIcon() {
  return L.divIcon({
    className: '',
    html: '<span role="img" aria-label="Re-measure requested" class="flex h-[26px] w-[26px] items-center justify-center rounded-md border-2 border-bg bg-brand text-lg font-bold text-bg">↻</span>',
    iconSize: [26, 26],
    iconAnchor: [-2, 28],
  });
}

function pendingIcon() {
  return L.divIcon({
    className: '',
    html: '<span role="img" aria-label="New station" class="block h-7 w-7 rounded-full border-4 border-dashed border-ring"></span>',
    iconSize: [28, 28],
    iconAnchor: [14, 14],
  });
}

export const PlanView = memo(function PlanView(props: PlanViewProps) {
  const { plan, imageUrl, stations, rooms, domain, selectedStationId, pendingPoint, walkPath, remeasureStationIds, className = '' } = props;
  const { theme } = useTheme();
  const { bounds, calibrated } = planImageBoundsM(plan);
  const leafletBounds = L.latLngBounds(bounds);
  const selected = stations.find((s) => s.id === selectedStationId) ?? null;
  const badges = stations.filter((s) => remeasureStationIds.has(s.id));
  const icons = useRef({ badge: badgeIcon(), pending: pendingIcon() });
  const accent = cssVar('--fw-accent', '#145955');
  const ring = cssVar('--fw-ring', '#a15726');
  const border = cssVar('--fw-field-border', '#66706c');

  return (
    <div className={`relative overflow-hidden rounded-lg border-2 border-border bg-surface-sunken ${className}`}>
      <MapContainer
        crs={L.CRS.Simple}
        bounds={leafletBounds}
        maxBounds={leafletBounds.pad(0.5)}
        minZoom={-3}
        maxZoom={7}
        zoomSnap={0.25}
        preferCanvas
        attributionControl={false}
        className="h-full w-full"
        style={{ background: 'transparent' }}
        aria-label="Plan of the level: tap to place a station or pick one"
      >
        {imageUrl && <ImageOverlay key={theme} url={imageUrl} bounds={leafletBounds} className={theme === 'hall' ? 'brightness-75' : ''} />}
        {rooms.map((r) => (
          <Polygon key={r.id} positions={r.polygon.map(([x, y]) => [y, x] as [number, number])} pathOptions={{ color: border, weight: 1, fill: false, interactive: false }} />
        ))}
        {walkPath.length > 1 && (
          <Polyline positions={walkPath.map(([x, y]) => [y, x] as [number, number])} pathOptions={{ color: accent, weight: 4, opacity: 0.85, dashArray: '8 6', interactive: false }} />
        )}
        <StationsLayer stations={stations} domain={domain} theme={theme} />
        {selected && <SelectedRing xM={selected.xM} yM={selected.yM} colour={ring} />}
        {pendingPoint && <Marker position={[pendingPoint.yM, pendingPoint.xM]} icon={icons.current.pending} interactive={false} keyboard={false} />}
        {badges.map((s) => (
          <Marker key={s.id} position={[s.yM, s.xM]} icon={icons.current.badge} interactive={false} keyboard={false} />
        ))}
        <TapHandler stations={stations} onPick={props.onPick} onPlace={props.onPlace} />
      </MapContainer>
      {!calibrated && (
        <p className="absolute bottom-2 left-2 z-[500] rounded bg-warning-soft px-2 py-1 text-sm font-bold text-warning">Plan not calibrated: positions are in pixels</p>
      )}
      {imageUrl === null && (
        <p className="absolute left-2 top-2 z-[500] rounded bg-warning-soft px-2 py-1 text-sm font-bold text-warning">No plan image on this device</p>
      )}
    </div>
  );
});

function SelectedRing({ xM, yM, colour }: { xM: number; yM: number; colour: string }) {
  const map = useMap();
  useEffect(() => {
    const outer = L.circleMarker([yM, xM], { radius: STATION_RADIUS_PX + 7, color: colour, weight: 4, fill: false, interactive: false }).addTo(map);
    return () => {
      outer.remove();
    };
  }, [map, xM, yM, colour]);
  return null;
}

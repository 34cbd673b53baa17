/**
 * The plan view: the level's plan image in Leaflet's CRS.Simple with one map unit = one plan metre,
 * stations as canvas dots coloured by their latest |B| (log scale), the rooms' outlines, the current
 * walk's path, re-measure badges, and tap-to-pick-or-place.
 *
 * Stations are drawn imperatively on one canvas rather than as thousands of React children or Leaflet
 * layers: 5,000 stations stay one <canvas> and one pass, and a tap is hit-tested in metres
 * (lib/hit-test) instead of by Leaflet's per-layer event handling.
 */
import 'leaflet/dist/leaflet.css';
import L from 'leaflet';
import { memo, useEffect, useMemo, useRef } from 'react';
import { ImageOverlay, MapContainer, Marker, Polygon, Polyline, useMap, useMapEvents } from 'react-leaflet';
import { useTheme } from '@/lib/theme';
import { fieldPosition, NO_READING_COLOUR, rampColour, type FieldDomain } from '@/lib/colour-scale';
import { nearestWithin, TAP_RADIUS_PX } from '../lib/hit-test';
import { planImageBoundsM, type PlanCalibrationInput } from '@/lib/plan-frame';

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
  /** Undefined while they are being read: nothing is drawn (and no empty plan flashes) until they are. */
  stations: readonly PlanStation[] | undefined;
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
/** Colour steps of the dots along the log-|B| ramp: 64 over the legend's 2–8 decades. */
const DOT_COLOUR_STEPS = 64;

/** A station as drawn: where (metres) and how (fill colour, or hollow for no reading yet). */
interface Dot {
  xM: number;
  yM: number;
  /** Fill colour, or null for a hollow ring (no reading yet). */
  fill: string | null;
}

/**
 * One canvas for every station, drawn in one pass by Leaflet's canvas renderer machinery (it sizes,
 * positions and pans the canvas, and calls _draw after every move and zoom) but without one Leaflet
 * layer per station: 5,000 layers cost more to create and project than the dots cost to draw.
 */
const StationCanvas = L.Canvas.extend({
  setDots(this: StationCanvasInstance, dots: readonly Dot[], outline: string, onDrawn: () => void) {
    this._dots = dots;
    this._outline = outline;
    this._onDrawn = onDrawn;
    if (!this._map) return;
    this._redrawBounds = null;
    if (!this._drawnOnce) {
      // The first list is drawn at once: the dots are on the canvas when the data is, not a frame later.
      this._drawnOnce = true;
      if (this._redrawRequest) L.Util.cancelAnimFrame(this._redrawRequest);
      this._redraw();
      return;
    }
    // Later lists (a save re-colours a dot): the whole canvas once per frame, however often they come.
    this._redrawRequest = this._redrawRequest || L.Util.requestAnimFrame(this._redraw, this);
  },
  _draw(this: StationCanvasInstance) {
    const ctx = this._ctx;
    const dots = this._dots ?? [];
    const map = this._map;
    if (!ctx || !map) return;
    const { min, max } = this._bounds;
    if (!min || !max) return;
    const r = STATION_RADIUS_PX;
    ctx.save();
    ctx.globalAlpha = 1;
    // Filled dots: outlined in the theme's foreground; one path per colour keeps state changes few.
    const byFill = new Map<string, Array<{ x: number; y: number }>>();
    const hollow: Array<{ x: number; y: number }> = [];
    for (const d of dots) {
      const p = map.latLngToLayerPoint([d.yM, d.xM]);
      if (p.x < min.x - r - 3 || p.x > max.x + r + 3 || p.y < min.y - r - 3 || p.y > max.y + r + 3) continue;
      if (d.fill === null) hollow.push(p);
      else {
        const list = byFill.get(d.fill);
        if (list) list.push(p);
        else byFill.set(d.fill, [p]);
      }
    }
    ctx.lineWidth = 1.5;
    ctx.strokeStyle = this._outline ?? '#101918';
    for (const [fill, points] of byFill) {
      ctx.beginPath();
      for (const p of points) {
        ctx.moveTo(p.x + r, p.y);
        ctx.arc(p.x, p.y, r, 0, Math.PI * 2);
      }
      ctx.fillStyle = fill;
      ctx.fill();
      ctx.stroke();
    }
    if (hollow.length > 0) {
      ctx.beginPath();
      for (const p of hollow) {
        ctx.moveTo(p.x + r, p.y);
        ctx.arc(p.x, p.y, r, 0, Math.PI * 2);
      }
      ctx.lineWidth = 3;
      ctx.strokeStyle = NO_READING_COLOUR;
      ctx.stroke();
    }
    ctx.restore();
    const done = this._onDrawn;
    this._onDrawn = undefined;
    done?.();
  },
});

/** What StationCanvas adds, and the renderer internals it uses (Leaflet 1.9 Canvas). */
interface StationCanvasInstance {
  addTo(map: L.Map): unknown;
  remove(): unknown;
  _dots?: readonly Dot[];
  _outline?: string;
  _onDrawn?: () => void;
  _drawnOnce?: boolean;
  _ctx?: CanvasRenderingContext2D;
  _map?: L.Map;
  _bounds: L.Bounds;
  _redrawBounds: L.Bounds | null;
  _redrawRequest: number | null;
  _redraw: () => void;
  setDots(dots: readonly Dot[], outline: string, onDrawn: () => void): void;
}

/**
 * The stations on one canvas. A save re-colours one dot: the dots are rebuilt from the list (cheap
 * arithmetic) and drawn again in the next frame, one pass for all of them. The mark
 * 'capture:stations-drawn' (read by tests/bench/capture.bench.ts) is set when a list has been drawn.
 */
function StationsLayer({ stations, domain, theme }: { stations: readonly PlanStation[] | undefined; domain: FieldDomain; theme: string }) {
  const map = useMap();
  const renderer = useMemo(() => new (StationCanvas as unknown as new (options: L.RendererOptions) => StationCanvasInstance)({ padding: 0.5 }), []);
  const colours = useRef(new Map<string, string | null>());

  useEffect(() => {
    renderer.addTo(map);
    return () => {
      renderer.remove();
    };
  }, [map, renderer]);

  useEffect(() => {
    // Nothing to draw until the stations are read: the first paint is the real one.
    if (stations === undefined) return;
    const outline = cssVar('--fw-fg', '#101918');
    // One colour per ramp step, worked out once per domain.
    const key = `${domain.minT}:${domain.maxT}`;
    if (colours.current.get('') !== key) {
      colours.current = new Map([['', key]]);
    }
    const cache = colours.current;
    const dots: Dot[] = new Array(stations.length);
    for (let i = 0; i < stations.length; i++) {
      const s = stations[i] as PlanStation;
      // The ramp in DOT_COLOUR_STEPS steps (finer than the eye tells apart on a 7 px dot): the canvas
      // then fills one path per step, not one per station.
      const step = s.latestFieldT === null ? -1 : Math.round(fieldPosition(s.latestFieldT, domain) * (DOT_COLOUR_STEPS - 1));
      const k = String(step);
      let fill = cache.get(k);
      if (fill === undefined) {
        fill = step < 0 ? null : rampColour(step / (DOT_COLOUR_STEPS - 1));
        cache.set(k, fill);
      }
      dots[i] = { xM: s.xM, yM: s.yM, fill };
    }
    const count = stations.length;
    renderer.setDots(dots, outline, () => {
      map.getContainer().dataset.stationsDrawn = String(count);
      if (typeof performance.mark === 'function') performance.mark('capture:stations-drawn', { detail: { count } });
    });
  }, [map, renderer, stations, domain, theme]);
  return null;
}

const NO_STATIONS: readonly PlanStation[] = [];

function TapHandler({ stations, onPick, onPlace }: { stations: readonly PlanStation[] } & Pick<PlanViewProps, 'onPick' | 'onPlace'>) {
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

/** The plan image and the room outlines: re-rendered only when the plan, its rooms or the theme change, never by a save. */
const PlanBackdrop = memo(function PlanBackdrop({ imageUrl, bounds, rooms, theme }: { imageUrl: string | null | undefined; bounds: L.LatLngBounds; rooms: readonly PlanRoom[]; theme: string }) {
  const border = useMemo(() => cssVar('--fw-field-border', '#66706c'), [theme]); // eslint-disable-line react-hooks/exhaustive-deps
  const pathOptions = useMemo(() => ({ color: border, weight: 1, fill: false, interactive: false }), [border]);
  const outlines = useMemo(() => rooms.map((r) => ({ id: r.id, positions: r.polygon.map(([x, y]) => [y, x] as [number, number]) })), [rooms]);
  return (
    <>
      {imageUrl && <ImageOverlay key={theme} url={imageUrl} bounds={bounds} className={theme === 'hall' ? 'brightness-75' : ''} />}
      {outlines.map((r) => (
        <Polygon key={r.id} positions={r.positions} pathOptions={pathOptions} />
      ))}
    </>
  );
});

/** The current walk's path; the same points keep the same line (a save at the same station redraws nothing). */
const WalkPathLine = memo(
  function WalkPathLine({ walkPath, theme }: { walkPath: ReadonlyArray<readonly [number, number]>; theme: string }) {
    const accent = useMemo(() => cssVar('--fw-accent', '#145955'), [theme]); // eslint-disable-line react-hooks/exhaustive-deps
    const pathOptions = useMemo(() => ({ color: accent, weight: 4, opacity: 0.85, dashArray: '8 6', interactive: false }), [accent]);
    const positions = useMemo(() => walkPath.map(([x, y]) => [y, x] as [number, number]), [walkPath]);
    if (walkPath.length < 2) return null;
    return <Polyline positions={positions} pathOptions={pathOptions} />;
  },
  (a, b) => a.theme === b.theme && a.walkPath.length === b.walkPath.length && a.walkPath.every((p, i) => p[0] === b.walkPath[i]?.[0] && p[1] === b.walkPath[i]?.[1]),
);

export const PlanView = memo(function PlanView(props: PlanViewProps) {
  const { plan, imageUrl, rooms, domain, selectedStationId, pendingPoint, walkPath, remeasureStationIds, className = '' } = props;
  const stations = props.stations ?? NO_STATIONS;
  const { theme } = useTheme();
  const { bounds, calibrated } = planImageBoundsM(plan);
  const boundsKey = JSON.stringify(bounds);
  const leafletBounds = useMemo(() => L.latLngBounds(bounds), [boundsKey]); // eslint-disable-line react-hooks/exhaustive-deps
  const selected = stations.find((s) => s.id === selectedStationId) ?? null;
  const badges = useMemo(() => (remeasureStationIds.size === 0 ? NO_STATIONS : stations.filter((s) => remeasureStationIds.has(s.id))), [stations, remeasureStationIds]);
  const icons = useRef({ badge: badgeIcon(), pending: pendingIcon() });
  const ring = useMemo(() => cssVar('--fw-ring', '#a15726'), [theme]); // eslint-disable-line react-hooks/exhaustive-deps -- the theme changes the CSS variable

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
        <PlanBackdrop imageUrl={imageUrl} bounds={leafletBounds} rooms={rooms} theme={theme} />
        <WalkPathLine walkPath={walkPath} theme={theme} />
        <StationsLayer stations={props.stations} domain={domain} theme={theme} />
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
